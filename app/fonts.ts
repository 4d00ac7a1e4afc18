import localFont from "next/font/local";

// Shipped in fonts/ (see fonts/README.md for licences); never fetched from the web.
export const inter = localFont({
  src: "../fonts/inter-latin-wght.woff2",
  variable: "--font-inter",
  weight: "100 900",
  display: "swap",
});

export const jetbrains = localFont({
  src: "../fonts/jetbrains-mono-latin-wght.woff2",
  variable: "--font-jetbrains",
  weight: "100 800",
  display: "swap",
});
