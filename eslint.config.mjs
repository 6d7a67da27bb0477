import nextVitals from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";

// The computation core stays framework-free: it runs in the browser worker, on the server and in CLIs.
const pureCore = ["lib/mesh/**", "lib/plan/**", "lib/estimate/**", "lib/orient/**", "lib/rules/**"];

const config = [
  { ignores: [".next/**", "node_modules/**", ".data/**", "drizzle/**", "test-results/**", "playwright-report/**", "next-env.d.ts", "tests/e2e/.auth/**"] },
  ...nextVitals,
  ...nextTs,
  {
    files: pureCore,
    rules: {
      "no-restricted-imports": [
        "error",
        {
          patterns: [
            { group: ["react", "react-*", "next", "next/*", "next-auth*", "three", "three/*", "@react-three/*", "drizzle-orm*", "mysql2*", "@/app/*", "@/components/*", "@/db/*", "@/lib/server/*"], message: "lib/ core modules stay framework-free." },
          ],
        },
      ],
    },
  },
  {
    rules: {
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_" }],
    },
  },
];
export default config;
