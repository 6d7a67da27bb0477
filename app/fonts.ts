import localFont from "next/font/local";

// Inter ships inside the app (npm @fontsource-variable/inter, SIL OFL 1.1): nothing is fetched at build.
export const inter = localFont({
  src: [
    { path: "../node_modules/@fontsource-variable/inter/files/inter-latin-wght-normal.woff2", style: "normal" },
    { path: "../node_modules/@fontsource-variable/inter/files/inter-latin-ext-wght-normal.woff2", style: "normal" },
  ],
  variable: "--font-inter",
  display: "swap",
  weight: "100 900",
});
