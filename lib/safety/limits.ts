/**
 * The figures and sources behind Blockyard's safety cautions (../shared/domain-brief.md §5).
 * One module, so the safety page and its test read the same numbers. Cautions only: local codes,
 * the material's safety data sheet and licensed practice decide.
 */
export const STYRENE = {
  oshaPelTwaPpm: 100,
  oshaCeilingPpm: 200,
  oshaPeakPpm: 600,
  nioshRelTwaPpm: 50,
  nioshStelPpm: 100,
  idlhPpm: 700,
  iarcGroup: "2A",
  iarcYear: 2018,
} as const;

export const HIGH_PILED = {
  /** IFC 2018 ch. 32: storage above this height is high-piled. */
  generalFt: 12,
  /** …and above this height for Group A plastics (exposed expanded plastics, NFPA 13). */
  groupAPlasticsFt: 6,
  /** A high-piled storage area above this needs a permit. */
  permitAreaFt2: 500,
} as const;

export const WIRE = { minC: 200, maxC: 300 } as const;
export const PU_DECOMPOSES_ABOVE_C = 200;

export interface SafetySource {
  id: string;
  topic: string;
  caution: string;
  source: string;
}

export const SAFETY_SOURCES: SafetySource[] = [
  {
    id: "styrene",
    topic: "Styrene from heated polystyrene",
    caution: `Cutting EPS and XPS with a hot wire gives off styrene. Limits: OSHA PEL ${STYRENE.oshaPelTwaPpm} ppm (8-hour TWA), ${STYRENE.oshaCeilingPpm} ppm ceiling, ${STYRENE.oshaPeakPpm} ppm peak; NIOSH REL ${STYRENE.nioshRelTwaPpm} ppm TWA, ${STYRENE.nioshStelPpm} ppm STEL; IDLH ${STYRENE.idlhPpm} ppm. Ventilate; large bench cutters may need local exhaust. Use the lowest wire heat that cuts — the wire should never smoke.`,
    source: "OSHA 29 CFR 1910.1000 Table Z-2; NIOSH Pocket Guide to Chemical Hazards (styrene)",
  },
  {
    id: "iarc",
    topic: "Styrene and cancer",
    caution: `IARC classifies styrene as probably carcinogenic to humans (Group ${STYRENE.iarcGroup}, ${STYRENE.iarcYear}). Keep exposure low even below the limits.`,
    source: `IARC Monographs volume 121 (${STYRENE.iarcYear})`,
  },
  {
    id: "pu",
    topic: "Never hot-wire polyurethane",
    caution: `Above about ${PU_DECOMPOSES_ABOVE_C} °C polyurethane gives off isocyanates, amines, hydrogen cyanide and carbon monoxide. Route or carve PU foam, including high-density sign foam.`,
    source: "American Chemistry Council, Center for the Polyurethanes Industry: thermal degradation guidance",
  },
  {
    id: "burns",
    topic: "Hot-wire burns",
    caution: `The wire runs at ${WIRE.minC}–${WIRE.maxC} °C and long wires carry tens of volts. Never leave a hot wire unattended.`,
    source: "Common practice; the cutter maker's manual",
  },
  {
    id: "pentane",
    topic: "Pentane from fresh foam",
    caution:
      "Fresh EPS off-gases pentane, which can reach flammable levels in closed storage. Store fresh blocks ventilated, away from ignition sources.",
    source: "The material's safety data sheet (SDS)",
  },
  {
    id: "nfpa13",
    topic: "Fire load of stored foam",
    caution:
      "Foam burns, even flame-retardant grades. Exposed expanded plastics are Group A, the highest storage hazard class for sprinkler design.",
    source: "NFPA 13, Standard for the Installation of Sprinkler Systems (commodity classification)",
  },
  {
    id: "ifc",
    topic: "High-piled storage",
    caution: `Storage above ${HIGH_PILED.generalFt} ft is high-piled — above ${HIGH_PILED.groupAPlasticsFt} ft for Group A plastics such as foam — and more than ${HIGH_PILED.permitAreaFt2} ft² of it needs a permit. Local editions differ: ask your fire authority.`,
    source: "International Fire Code (2018), chapter 32: High-piled combustible storage",
  },
];

export const DEFER =
  "These are cautions, not rules: follow your local codes and fire authority, the material's safety data sheet and licensed practice.";
