// Plain-language meaning of each measure, for an SRE reading the table or a component page.
export const MEASURE_HELP = {
  betweenness: {
    label: "Betweenness",
    short: "Share of shortest dependency paths between other components that run through this one. High: many chains of calls cross it.",
  },
  pagerank: {
    label: "PageRank",
    short: "How much the estate leans on it, counting leaning of important dependents more. High: widely and deeply needed.",
  },
  eigenvector: {
    label: "Eigenvector",
    short: "How well connected its neighbours are, ignoring direction. High: it sits in the busy core of the graph.",
  },
  clustering: {
    label: "Clustering",
    short: "How many of its neighbours also connect to each other (0–1). Low with many neighbours: it is the only link between them.",
  },
  blastDown: {
    label: "Takes down",
    short: "Components that go down if it fails alone (hard needs, any-of groups honoured), itself not counted.",
  },
  blastDegraded: {
    label: "Degraded",
    short: "Components that keep running but degraded if it fails (soft needs).",
  },
  entriesDominated: {
    label: "Entry points",
    short: "Entry points (tier 1, nothing depends on them) from which every path to some components passes through it: lose it and those entry points lose them.",
  },
  pinchScore: {
    label: "Pinch score",
    short: "0–100 blend of betweenness, tier-weighted blast radius and single-instance risk; weights set per environment.",
  },
  articulation: {
    label: "Splits the graph",
    short: "Removing it splits the graph into disconnected parts (an articulation point).",
  },
  inCycle: {
    label: "In a cycle",
    short: "Part of a dependency cycle: these components cannot cold-start without each other.",
  },
  single: {
    label: "Single",
    short: "One replica, or runs in fewer than two zones: one machine or zone loss takes it out.",
  },
} as const;
