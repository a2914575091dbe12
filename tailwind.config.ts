import type { Config } from "tailwindcss";

// Cloche's palette: leaf greens for the living things and primary actions, soil
// browns for warmth and accents, frost neutrals for surfaces and text, ember for
// cautions about heat and power.
const config: Config = {
  theme: {
    extend: {
      colors: {
        leaf: {
          50: "#f2f7f1",
          100: "#e1eedd",
          200: "#c3dcbb",
          300: "#9cc38f",
          400: "#72a563",
          500: "#538845",
          600: "#406c35",
          700: "#34562c",
          800: "#2c4526",
          900: "#253a21",
          950: "#12200f",
        },
        soil: {
          50: "#faf6f1",
          100: "#f1e8dc",
          200: "#e2cfb6",
          300: "#cfb08a",
          400: "#b98e61",
          500: "#a07448",
          600: "#845d3b",
          700: "#6a4932",
          800: "#573d2c",
          900: "#483327",
        },
        frost: {
          50: "#f6f8f9",
          100: "#eceff2",
          200: "#d7dde3",
          300: "#b5c0ca",
          400: "#8d9cab",
          500: "#5f6e7e",
          600: "#596777",
          700: "#495461",
          800: "#3f4852",
          900: "#373e46",
          950: "#22272d",
        },
        ember: {
          50: "#fdf5ec",
          100: "#fae6cf",
          200: "#f3c99b",
          500: "#c8702a",
          600: "#ad5a20",
          700: "#8f4a1c",
          800: "#733d1a",
        },
      },
      fontFamily: {
        sans: ["var(--font-inter)", "ui-sans-serif", "system-ui", "sans-serif"],
      },
      borderRadius: {
        card: "0.875rem",
      },
    },
  },
};

export default config;
