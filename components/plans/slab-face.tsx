/**
 * A slab of true-shape nested profiles, drawn to scale in its face as the profile cutter sees it
 * (u across, v up): every member's outline with its holes (a tapered part's tip section dashed),
 * its lead-in corridor from the slab face to the wire's path with the entry marked, and a number
 * on each member. Beside the drawing, the same facts as a numbered list (part, turn, lead-in face)
 * for people who cannot see the drawing. Pure markup: renders on the server and in the browser.
 */
import type { FacePoint, LeadInFace, PartOutline, SlabLayout } from "@/lib/nesting";
import { slabFaceDrawing } from "@/lib/planning/slab-face";

export interface SlabFaceProps {
  /** The slab's id in the plan, e.g. "slab-2". */
  id: string;
  slab: SlabLayout;
  /** Part id (as in the plan) → its outline; a member without one is drawn as a missing part. */
  outlines: ReadonlyMap<string, PartOutline>;
  /** Kerf of the profile cut, mm: the corridor is drawn this wide. */
  kerf: number;
  partName: (partId: string) => string;
  /** The list of members under the drawing (on by default). */
  facts?: boolean;
}

const FACE_WORDS: Record<LeadInFace, string> = {
  left: "from the left face",
  right: "from the right face",
  top: "from the top face",
};
const PART_FILL = "#d7ecee";
const PART_LINE = "#1f6c75";
const CORRIDOR = "#d2571f";
const LABEL = "#16525a";

/** Sizes to a tenth of a millimetre, as a cutter reads them off a rule. */
const tenth = (v: number) => (Math.round(v * 10) / 10).toString();

const pts = (loop: readonly FacePoint[]) => loop.map(([x, y]) => `${x},${y}`).join(" ");

/**
 * The face of one slab with its members and their lead-ins.
 *
 *   <SlabFace id="slab-1" slab={placement.slab} outlines={outlines} kerf={1.2} partName={(k) => names.get(k) ?? k} />
 */
export function SlabFace({ id, slab, outlines, kerf, partName, facts = true }: SlabFaceProps) {
  const d = slabFaceDrawing(slab, outlines);
  const [, U, V] = slab.size;
  const pad = Math.max(U, V) * 0.04;
  // About 1/30 of the longer side: the drawing is shown at most 75 % of the screen high, so ~20 px.
  const font = Math.max(U, V) / 30;
  return (
    <figure className="space-y-2">
      <figcaption className="text-xs font-medium uppercase tracking-wide text-ink-faint">
        {`Face of ${id}: ${tenth(slab.size[1])} × ${tenth(slab.size[2])} mm, ${tenth(slab.size[0])} mm thick, ${slab.members.length} profiles`}
      </figcaption>
      <svg
        viewBox={`${-pad} ${-pad} ${U + pad * 2} ${V + pad * 2}`}
        className="max-h-[75vh] w-full max-w-3xl"
        role="img"
        aria-label={`Face of ${id} with ${slab.members.length} profiles and their lead-ins`}
      >
        <title>{`Face of ${id}: ${slab.members.length} profiles, each with its lead-in from a slab face; the list below says the same in words`}</title>
        {/* The face's v axis points up: flip once, so every loop is drawn in its own millimetres. */}
        <g transform={`translate(0 ${V}) scale(1 -1)`}>
          <rect x={0} y={0} width={U} height={V} fill="#f7f5ef" stroke="#1c2a2e" strokeWidth={font / 6} />
          {d.members.map((m) => (
            <g key={m.n}>
              {m.tip && (
                <polygon
                  points={pts(m.tip)}
                  fill="none"
                  stroke={PART_LINE}
                  strokeWidth={font / 10}
                  strokeDasharray={`${font / 3} ${font / 4}`}
                />
              )}
              {m.outer ? (
                <path
                  d={[m.outer, ...m.holes].map((l) => `M${pts(l)}Z`).join(" ")}
                  fill={PART_FILL}
                  fillRule="evenodd"
                  stroke={PART_LINE}
                  strokeWidth={font / 8}
                />
              ) : (
                <circle cx={m.label[0]} cy={m.label[1]} r={font} fill="none" stroke="#a8322a" strokeWidth={font / 8} />
              )}
              <line
                x1={m.corridor[0][0]}
                y1={m.corridor[0][1]}
                x2={m.corridor[1][0]}
                y2={m.corridor[1][1]}
                stroke={CORRIDOR}
                strokeWidth={Math.max(kerf, font / 8)}
                strokeLinecap="round"
              />
              <circle cx={m.corridor[1][0]} cy={m.corridor[1][1]} r={font / 4} fill={CORRIDOR} />
            </g>
          ))}
        </g>
        {d.members.map((m) => (
          <text
            key={m.n}
            x={m.label[0]}
            y={V - m.label[1]}
            fontSize={font}
            fontWeight={600}
            textAnchor="middle"
            dominantBaseline="central"
            fill={LABEL}
          >
            {m.n}
          </text>
        ))}
      </svg>
      {facts && (
        <ol className="grid list-none gap-x-6 text-sm sm:grid-cols-2">
          {d.members.map((m) => (
            <li key={m.n} className="tabular-nums">
              <span className="font-semibold">{m.n}.</span> {partName(slab.members[m.n - 1]!.part)}
              {m.rotation ? `, turned ${m.rotation}°` : ""}, lead-in{" "}
              {m.via ? `through the cut of ${m.via} (a bridge across the waste)` : FACE_WORDS[m.face]}
              {m.outer ? "" : " (no outline on record)"}
            </li>
          ))}
        </ol>
      )}
    </figure>
  );
}
