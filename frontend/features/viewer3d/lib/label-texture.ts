/**
 * Text labels drawn into a canvas and used as sprite textures. They need no font file
 * from the network (unlike SDF text) and, being part of the WebGL picture, they appear in
 * the exported PNG.
 */
import { CanvasTexture, LinearFilter, SRGBColorSpace } from "three";

export interface LabelTexture {
  texture: CanvasTexture;
  /** width / height of the texture, to size the sprite */
  aspect: number;
}

const cache = new Map<string, LabelTexture>();
export const LABEL_FONT = `"Manrope", ui-sans-serif, system-ui, sans-serif`;

/** A pill with `text` in `colour` on a dark translucent ground, optionally ringed; cached by content. */
export function labelTexture(text: string, colour: string, opts: { weight?: number; pill?: boolean; ring?: string } = {}): LabelTexture {
  const weight = opts.weight ?? 700;
  const pill = opts.pill ?? true;
  const ring = opts.ring ?? "";
  const key = `${text}\u0000${colour}\u0000${weight}\u0000${pill}\u0000${ring}`;
  const hit = cache.get(key);
  if (hit) return hit;
  const px = 48; // drawn large, shown small: crisp at any device pixel ratio
  const pad = pill ? px * 0.42 : px * 0.1;
  const probe = document.createElement("canvas").getContext("2d")!;
  probe.font = `${weight} ${px}px ${LABEL_FONT}`;
  const w = Math.ceil(probe.measureText(text).width + 2 * pad);
  const h = Math.ceil(px * 1.45);
  const canvas = document.createElement("canvas");
  canvas.width = w;
  canvas.height = h;
  const g = canvas.getContext("2d")!;
  if (pill) {
    g.fillStyle = "rgba(15, 22, 29, 0.78)";
    const r = h / 2;
    g.beginPath();
    g.moveTo(r, 0);
    g.lineTo(w - r, 0);
    g.arc(w - r, r, r, -Math.PI / 2, Math.PI / 2);
    g.lineTo(r, h);
    g.arc(r, r, r, Math.PI / 2, (3 * Math.PI) / 2);
    g.closePath();
    g.fill();
    if (ring) {
      // a ring in the owner's colour (the sensor die the axis belongs to)
      g.strokeStyle = ring;
      g.lineWidth = px * 0.16;
      g.stroke();
    }
  }
  g.font = `${weight} ${px}px ${LABEL_FONT}`;
  g.fillStyle = colour;
  g.textAlign = "center";
  g.textBaseline = "middle";
  g.fillText(text, w / 2, h / 2 + px * 0.04);
  const texture = new CanvasTexture(canvas);
  texture.colorSpace = SRGBColorSpace;
  texture.minFilter = LinearFilter;
  texture.generateMipmaps = false;
  const made = { texture, aspect: w / h };
  cache.set(key, made);
  return made;
}
