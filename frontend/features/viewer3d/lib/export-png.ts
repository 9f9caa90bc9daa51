/**
 * "Save picture": the WebGL picture (kept by preserveDrawingBuffer) with a legend and a
 * caption burnt in, so the image explains itself when pasted into a report.
 */
import { LABEL_FONT } from "./label-texture";
import { INK, PAPER } from "./palette";

export interface SnapshotText {
  title: string;
  lines: string[];
  legend: { label: string; colour: string; translucent?: boolean }[];
}

export function composeSnapshot(source: HTMLCanvasElement, text: SnapshotText): string {
  const w = source.width,
    h = source.height;
  const scale = Math.max(1, w / 1100);
  const canvas = document.createElement("canvas");
  canvas.width = w;
  canvas.height = h;
  const g = canvas.getContext("2d")!;
  g.fillStyle = INK;
  g.fillRect(0, 0, w, h);
  g.drawImage(source, 0, 0);

  // caption band at the bottom
  const fs = 13 * scale;
  const lineH = fs * 1.45;
  const bandH = lineH * (1 + text.lines.length) + fs;
  g.fillStyle = "rgba(15, 22, 29, 0.82)";
  g.fillRect(0, h - bandH, w, bandH);
  g.textBaseline = "top";
  g.fillStyle = PAPER;
  g.font = `700 ${fs * 1.05}px ${LABEL_FONT}`;
  g.fillText(text.title, fs, h - bandH + fs * 0.6);
  g.font = `500 ${fs}px ${LABEL_FONT}`;
  g.fillStyle = "rgba(247, 245, 240, 0.78)";
  text.lines.forEach((l, i) => g.fillText(l, fs, h - bandH + fs * 0.6 + lineH * (i + 1)));

  // legend at the top left
  const items = text.legend;
  if (items.length > 0) {
    g.font = `600 ${fs}px ${LABEL_FONT}`;
    const sw = fs * 0.9;
    const widest = Math.max(...items.map((it) => g.measureText(it.label).width));
    const boxW = widest + sw + fs * 2.2,
      boxH = items.length * lineH + fs * 0.9;
    g.fillStyle = "rgba(15, 22, 29, 0.72)";
    g.fillRect(fs * 0.8, fs * 0.8, boxW, boxH);
    items.forEach((it, i) => {
      const y = fs * 0.8 + fs * 0.45 + i * lineH;
      g.globalAlpha = it.translucent ? 0.55 : 1;
      g.fillStyle = it.colour;
      g.fillRect(fs * 1.5, y + (lineH - sw) / 2 - fs * 0.1, sw, sw);
      g.globalAlpha = 1;
      g.fillStyle = PAPER;
      g.fillText(it.label, fs * 1.5 + sw + fs * 0.6, y + fs * 0.12);
    });
  }
  return canvas.toDataURL("image/png");
}

/** A file name from free text: letters, digits and dashes. */
export function fileSlug(text: string): string {
  return (
    text
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, "-")
      .replace(/^-+|-+$/g, "")
      .slice(0, 60) || "stack"
  );
}
