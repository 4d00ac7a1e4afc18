// Lint: the recommended rules of ESLint and typescript-eslint, plus React's hooks rules, plus the layers
// (DEVELOPERS.md "Layers"): only lib/data, models/ and scripts/ touch Sequelize; screens and client code reach
// the server through the API and take their types from lib/api/schemas; the analysis, the importers and the
// schemas stay pure. no-restricted-imports settings do not merge between blocks (the last block that matches a
// file wins), so the blocks below match disjoint sets of files.
import js from "@eslint/js";
import reactHooks from "eslint-plugin-react-hooks";
import tseslint from "typescript-eslint";

export default tseslint.config(
  { ignores: [".next/**", ".next-*/**", "node_modules/**", ".data/**", "next-env.d.ts", "coverage/**", "test-results/**"] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    files: ["**/*.{ts,tsx}"],
    plugins: { "react-hooks": reactHooks },
    rules: {
      "react-hooks/rules-of-hooks": "error",
      "react-hooks/exhaustive-deps": "warn",
      "@typescript-eslint/no-explicit-any": "error",
      "@typescript-eslint/consistent-type-imports": ["error", { fixStyle: "inline-type-imports" }],
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_" }],
      "no-console": "off",
    },
  },
  ...layers(),
  {
    files: ["**/*.{js,mjs,cjs}"],
    languageOptions: { globals: { process: "readonly", console: "readonly", __dirname: "readonly", require: "readonly", module: "writable" } },
  },
);

function layers() {
  const group = (names, message) => ({ group: names, message });
  const database = group(["@/models", "@/models/*", "**/models", "**/models/*", "sequelize", "sequelize/*", "pg", "pg-boss"], "only lib/data, models/ and scripts/ touch the database");
  const dataLayer = group(["@/lib/data/*", "**/lib/data/*"], "go through the API (screens) or take the data as an argument (pure code); types come from lib/api/schemas");
  const serverOnly = group(["@/lib/jobs/*", "@/lib/mail/*", "**/lib/jobs/*", "**/lib/mail/*"], "the job runner and mail run on the server");
  const screens = group(["@/components/*", "**/components/*", "@/app/*"], "the layers below the screens never import them");
  const frameworks = group(["next", "next/*", "react", "react-dom", "react/*"], "pure code has no framework");
  const rule = (...patterns) => ({ "no-restricted-imports": ["error", { patterns }] });
  const pure = ["lib/analysis/**", "importers/**", "lib/api/schemas/**", "lib/inventory/**", "lib/impact/**", "lib/traces/**", "lib/map/**"];
  return [
    { files: ["components/**/*.{ts,tsx}", "lib/client/**/*.{ts,tsx}"], rules: rule(database, dataLayer, serverOnly) },
    { files: pure.map((p) => `${p}/*.{ts,tsx}`), rules: rule(database, dataLayer, serverOnly, screens, frameworks) },
    { files: ["app/**/*.{ts,tsx}"], rules: rule(database) },
    {
      files: ["lib/**/*.{ts,tsx}"],
      ignores: ["lib/data/**", "lib/client/**", ...pure],
      rules: rule(database, screens),
    },
    { files: ["lib/data/**/*.{ts,tsx}"], rules: rule(screens) },
  ];
}
