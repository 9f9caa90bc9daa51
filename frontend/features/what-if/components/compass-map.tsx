import { useMemo } from "react";
import { geoEqualEarth, geoGraticule10, geoPath } from "d3-geo";
import { contours } from "d3-contour";
import { feature } from "topojson-client";
import type { Topology, GeometryCollection } from "topojson-specification";
import type { MultiLineString, Polygon } from "geojson";
import land110 from "world-atlas/land-110m.json";
import type { InclinationGrid } from "@shared/schemas/what-if";
import { PALETTE } from "@shared/palette";
import { formatYield } from "@shared/format";

const WIDTH = 960;
const HEIGHT = 470;
// a JSON import is typed by its literal contents; world-atlas's file is a TopoJSON topology with a "land" object
const topology = land110 as unknown as Topology<{ land: GeometryCollection }>;
const land = feature(topology, topology.objects.land);

/**
 * The world coloured by the requirement's predicted yield at each place's field inclination
 * (green where it holds, red where it does not, stronger further from the target), with the
 * pass/fail boundary drawn where the yield crosses the target. Equal Earth projection (d3-geo),
 * land outline of Natural Earth 1:110m from the world-atlas package.
 */
export function CompassMap({
  grid,
  yields,
  edgeYields,
  target,
}: {
  grid: InclinationGrid;
  yields: (number | null)[][];
  /** the yields with the sweep's ends carried past its range: for the boundary line only */
  edgeYields: (number | null)[][];
  target: number;
}) {
  const { cells, boundary, path, graticule, outline } = useMemo(() => {
    const projection = geoEqualEarth().fitSize([WIDTH, HEIGHT], { type: "Sphere" });
    const path = geoPath(projection);
    const h = grid.stepDeg / 2;
    const cells: { d: string; fill: string; opacity: number; key: string }[] = [];
    grid.latitudes.forEach((lat, i) =>
      grid.longitudes.forEach((lon, j) => {
        const y = yields[i][j];
        if (y === null) return;
        // clockwise as drawn (north up): d3-geo reads such a ring as the small cell it encloses
        const ring: Polygon = {
          type: "Polygon",
          coordinates: [
            [
              [lon - h, lat - h],
              [lon - h, lat + h],
              [lon + h, lat + h],
              [lon + h, lat - h],
              [lon - h, lat - h],
            ],
          ],
        };
        const margin = Math.min(1, Math.abs(y - target) / Math.max(1e-6, 1 - target));
        cells.push({
          d: path(ring) ?? "",
          fill: y >= target ? PALETTE.pass : PALETTE.fail,
          opacity: 0.22 + 0.5 * Math.sqrt(margin),
          key: `${i}-${j}`,
        });
      }),
    );
    // the boundary: the target's contour on the grid, carried back to longitude and latitude
    const nx = grid.longitudes.length,
      ny = grid.latitudes.length;
    const values = edgeYields.flatMap((row) => row.map((y) => y ?? NaN));
    const [c] = contours().size([nx, ny]).thresholds([target])(values);
    const toLonLat = ([x, y]: number[]) => [-180 + (x / nx) * 360, -90 + (y / ny) * 180];
    // contour rings close along the grid's edge (the map's rim): keep only the pieces inside it
    const inside = ([x, y]: number[]) => x > 0 && x < nx && y > 0 && y < ny;
    const pieces: number[][][] = [];
    for (const ring of c ? c.coordinates.flat() : []) {
      let piece: number[][] = [];
      for (const pt of ring) {
        if (inside(pt)) piece.push(toLonLat(pt));
        else {
          if (piece.length > 1) pieces.push(piece);
          piece = [];
        }
      }
      if (piece.length > 1) pieces.push(piece);
    }
    const lines: MultiLineString = { type: "MultiLineString", coordinates: pieces };
    return { cells, boundary: path(lines) ?? "", path, graticule: path(geoGraticule10()) ?? "", outline: path({ type: "Sphere" }) ?? "" };
  }, [grid, yields, edgeYields, target]);

  return (
    <svg
      viewBox={`0 0 ${WIDTH} ${HEIGHT}`}
      className="w-full"
      role="img"
      aria-label={`World map of the predicted yield against its target ${formatYield(target)}`}
    >
      <path d={outline} fill={PALETTE.panel} stroke={PALETTE.line} />
      <g>
        {cells.map((c) => (
          <path key={c.key} d={c.d} fill={c.fill} fillOpacity={c.opacity} stroke="none" />
        ))}
      </g>
      <path d={graticule} fill="none" stroke={PALETTE.ink} strokeOpacity={0.08} />
      <path d={path(land) ?? ""} fill="none" stroke={PALETTE.ink} strokeWidth={0.8} strokeOpacity={0.75} />
      <path d={boundary} fill="none" stroke={PALETTE.ink} strokeWidth={2} strokeDasharray="6 3" data-testid="pass-fail-boundary" />
    </svg>
  );
}
