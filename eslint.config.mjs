import { FlatCompat } from "@eslint/eslintrc";
import { dirname } from "node:path";
import { fileURLToPath } from "node:url";

const compat = new FlatCompat({ baseDirectory: dirname(fileURLToPath(import.meta.url)) });

// The computation core stays framework-free: it runs in the browser worker, on the server and in CLIs.
const pureCore = ["lib/mesh/**", "lib/plan/**", "lib/estimate/**", "lib/orient/**"];

const config = [
  { ignores: [".next/**", "node_modules/**", ".data/**", "drizzle/**", "test-results/**", "playwright-report/**", "next-env.d.ts"] },
  ...compat.extends("next/core-web-vitals", "next/typescript"),
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
