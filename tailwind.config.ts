// Tailwind CSS 4 reads its theme from the `@theme` block in app/globals.css; this file only
// tells editors and tools where our classes live. The tokens (surfaces, brass accent, state
// colours, measure ramp) are documented there.
const config = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
};

export default config;
