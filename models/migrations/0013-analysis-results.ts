import type { MigrationFn } from "./types";

// Each analysis result stored where it is read (issue: the analysis graph was one multi-megabyte
// JSON value read whole for its cycles): per-component columns for boot stage, dominators and the
// ranks with ties (and the indexes the ranking's sorts use); the entries each component dominates
// from, as rows; dependency and boot cycles, as rows. analysis_runs.graph keeps a small summary.
// PageRank and eigenvector become nullable: a measure that did not converge is stored as NULL.
export const up: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query(`
    ALTER TABLE component_metrics
      ALTER COLUMN pagerank DROP NOT NULL,
      ALTER COLUMN eigenvector DROP NOT NULL,
      ADD COLUMN tied integer NOT NULL DEFAULT 1,
      ADD COLUMN rank_pagerank integer,
      ADD COLUMN tied_pagerank integer NOT NULL DEFAULT 1,
      ADD COLUMN rank_eigenvector integer,
      ADD COLUMN tied_eigenvector integer NOT NULL DEFAULT 1,
      ADD COLUMN rank_pinch integer,
      ADD COLUMN tied_pinch integer NOT NULL DEFAULT 1,
      ADD COLUMN rank_blast integer,
      ADD COLUMN tied_blast integer NOT NULL DEFAULT 1,
      ADD COLUMN boot_stage integer,
      ADD COLUMN waits_on_cycle boolean NOT NULL DEFAULT false,
      ADD COLUMN entry boolean NOT NULL DEFAULT false,
      ADD COLUMN entries_reaching integer,
      ADD COLUMN entries_dominated integer,
      ADD COLUMN max_dominated integer,
      ADD COLUMN dominated_all integer,
      ADD COLUMN idom_all varchar(128);

    CREATE TABLE component_dominance (
      snapshot_id uuid NOT NULL REFERENCES snapshots(id) ON DELETE CASCADE,
      key varchar(128) NOT NULL,
      entry varchar(128) NOT NULL,
      dominated integer NOT NULL,
      PRIMARY KEY (snapshot_id, key, entry)
    );
    CREATE INDEX component_dominance_entry ON component_dominance (snapshot_id, entry, dominated DESC);

    CREATE TABLE analysis_cycles (
      snapshot_id uuid NOT NULL REFERENCES snapshots(id) ON DELETE CASCADE,
      kind varchar(10) NOT NULL CHECK (kind IN ('runtime', 'boot')),
      position integer NOT NULL,
      members text[] NOT NULL,
      start_order text[],
      breaks jsonb,
      break_count integer,
      PRIMARY KEY (snapshot_id, kind, position)
    );

    -- Results already stored move out of the graph document.
    INSERT INTO analysis_cycles (snapshot_id, kind, position, members)
    SELECT a.snapshot_id, 'runtime', c.ord - 1, ARRAY(SELECT jsonb_array_elements_text(c.value))
      FROM analysis_runs a, jsonb_array_elements(a.graph -> 'cycles') WITH ORDINALITY AS c(value, ord)
     WHERE jsonb_typeof(a.graph -> 'cycles') = 'array';
    INSERT INTO analysis_cycles (snapshot_id, kind, position, members)
    SELECT a.snapshot_id, 'boot', c.ord - 1, ARRAY(SELECT jsonb_array_elements_text(c.value))
      FROM analysis_runs a, jsonb_array_elements(a.graph -> 'bootOrder' -> 'cycles') WITH ORDINALITY AS c(value, ord)
     WHERE jsonb_typeof(a.graph -> 'bootOrder' -> 'cycles') = 'array';
    UPDATE component_metrics m
       SET boot_stage = (a.graph -> 'perNode' -> m.key ->> 'bootStage')::integer,
           waits_on_cycle = COALESCE((a.graph -> 'bootOrder' -> 'waitingOnCycle') @> to_jsonb(m.key::text), false)
      FROM analysis_runs a
     WHERE a.snapshot_id = m.snapshot_id AND a.graph ? 'perNode';
    UPDATE component_metrics m
       SET rank = r.rank, tied = r.tied, rank_pagerank = r.rank_pagerank, rank_eigenvector = r.rank_eigenvector,
           rank_pinch = r.rank_pinch, rank_blast = r.rank_blast
      FROM (SELECT id,
                   rank() OVER (PARTITION BY snapshot_id ORDER BY betweenness DESC) AS rank,
                   count(*) OVER (PARTITION BY snapshot_id, betweenness) AS tied,
                   rank() OVER (PARTITION BY snapshot_id ORDER BY pagerank DESC) AS rank_pagerank,
                   rank() OVER (PARTITION BY snapshot_id ORDER BY eigenvector DESC) AS rank_eigenvector,
                   rank() OVER (PARTITION BY snapshot_id ORDER BY pinch_score DESC) AS rank_pinch,
                   rank() OVER (PARTITION BY snapshot_id ORDER BY blast_down DESC) AS rank_blast
              FROM component_metrics) r
     WHERE r.id = m.id;
    -- Bridges are read by the impact of a push (lib/data/impact.ts): a column of their own.
    ALTER TABLE analysis_runs ADD COLUMN bridges jsonb;
    UPDATE analysis_runs SET bridges = graph -> 'bridges' WHERE graph ? 'bridges';
    UPDATE analysis_runs SET graph = graph - 'perNode' - 'dominatorTrees' - 'dominatorRoots' - 'cycles' - 'bootOrder' - 'bridges' - 'implicitKeys'
     WHERE graph IS NOT NULL;

    -- The ranking sorts: each ranked measure walks its own index in rank order.
    DROP INDEX IF EXISTS component_metrics_rank;
    CREATE INDEX component_metrics_rank ON component_metrics (snapshot_id, rank, key);
    CREATE INDEX component_metrics_rank_pagerank ON component_metrics (snapshot_id, rank_pagerank, key);
    CREATE INDEX component_metrics_rank_eigenvector ON component_metrics (snapshot_id, rank_eigenvector, key);
    CREATE INDEX component_metrics_rank_pinch ON component_metrics (snapshot_id, rank_pinch, key);
    CREATE INDEX component_metrics_rank_blast ON component_metrics (snapshot_id, rank_blast, key);
    CREATE INDEX component_metrics_entries_dominated ON component_metrics (snapshot_id, entries_dominated DESC NULLS LAST, key);
  `);
};

export const down: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query(`
    DROP INDEX IF EXISTS component_metrics_rank_pagerank, component_metrics_rank_eigenvector, component_metrics_rank_pinch,
      component_metrics_rank_blast, component_metrics_entries_dominated;
    DROP TABLE IF EXISTS component_dominance, analysis_cycles;
    ALTER TABLE analysis_runs DROP COLUMN bridges;
    ALTER TABLE component_metrics
      DROP COLUMN tied, DROP COLUMN rank_pagerank, DROP COLUMN tied_pagerank, DROP COLUMN rank_eigenvector, DROP COLUMN tied_eigenvector,
      DROP COLUMN rank_pinch, DROP COLUMN tied_pinch, DROP COLUMN rank_blast, DROP COLUMN tied_blast, DROP COLUMN boot_stage,
      DROP COLUMN waits_on_cycle, DROP COLUMN entry, DROP COLUMN entries_reaching, DROP COLUMN entries_dominated,
      DROP COLUMN max_dominated, DROP COLUMN dominated_all, DROP COLUMN idom_all;
    UPDATE component_metrics SET pagerank = 0 WHERE pagerank IS NULL;
    UPDATE component_metrics SET eigenvector = 0 WHERE eigenvector IS NULL;
    ALTER TABLE component_metrics ALTER COLUMN pagerank SET NOT NULL, ALTER COLUMN eigenvector SET NOT NULL;
  `);
};
