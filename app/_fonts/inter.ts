import localFont from "next/font/local";

// The same TTF files the server renderer draws with (lib/server/render/fonts.ts), from one npm
// font package: nothing is fetched at build or run time, and screen and export match.
export const inter = localFont({
  src: [
    { path: "../../node_modules/@expo-google-fonts/inter/400Regular/Inter_400Regular.ttf", weight: "400", style: "normal" },
    { path: "../../node_modules/@expo-google-fonts/inter/500Medium/Inter_500Medium.ttf", weight: "500", style: "normal" },
    { path: "../../node_modules/@expo-google-fonts/inter/600SemiBold/Inter_600SemiBold.ttf", weight: "600", style: "normal" },
    { path: "../../node_modules/@expo-google-fonts/inter/700Bold/Inter_700Bold.ttf", weight: "700", style: "normal" },
  ],
  variable: "--font-inter",
  display: "swap",
});
