/** Writes the client's Tailwind theme colours from shared/palette.ts (run by `npm run palette`). */
import { writeFileSync } from "node:fs";
import { themeCss } from "@shared/palette";

writeFileSync(new URL("../../frontend/styles/palette.css", import.meta.url), themeCss());
