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
  /** g/mol, for ppm → mg/m³: C8H8 = 8 × 12.011 + 8 × 1.008 (arithmetic on standard atomic weights). */
  molarMass: 104.15,
} as const;

/** Litres of one mole of gas at 25 °C and 1 atm: the usual basis for ppm ↔ mg/m³ in exposure limits. */
export const MOLAR_VOLUME_25C_L = 24.45;

/**
 * A gas concentration in ppm as mg/m³ at 25 °C and 1 atm: ppm × molar mass / 24.45.
 *
 *   ppmToMgM3(50, STYRENE.molarMass)  // 213.0
 */
export const ppmToMgM3 = (ppm: number, molarMass: number) => (ppm * molarMass) / MOLAR_VOLUME_25C_L;

/** Pentane's lower explosive (flammable) limit in air, % by volume (common practice, no source in the trade brief). */
export const PENTANE_LEL_PCT = 1.5;

/**
 * n-Pentane, the blowing agent fresh EPS gives off: United States exposure limits as the NIOSH
 * Pocket Guide to Chemical Hazards lists them (from memory: the trade brief gives no pentane
 * limits). IDLH 1,500 ppm is set at 10 % of the lower explosive limit, not by toxicity.
 */
export const PENTANE = {
  oshaPelTwaPpm: 1000,
  nioshRelTwaPpm: 120,
  nioshCeilingPpm: 610,
  idlhPpm: 1500,
  /** g/mol: C5H12 = 5 × 12.011 + 12 × 1.008 (arithmetic on standard atomic weights). */
  molarMass: 72.15,
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
/** Polypropylene's melting range (trade brief §1, no source given): EPP needs a hotter wire than EPS. */
export const PP_MELTS_C = { min: 160, max: 166 } as const;

/** Where a caution is shown on the safety page. */
export type SafetySection = "fumes" | "wire" | "dust" | "fire" | "storage";

export const SAFETY_SECTIONS: { id: SafetySection; title: string }[] = [
  { id: "fumes", title: "Fumes from the hot wire" },
  { id: "wire", title: "The wire and its power supply" },
  { id: "dust", title: "Dust from sanding, rasping and routing" },
  { id: "fire", title: "Fire at the cutter" },
  { id: "storage", title: "Stored foam" },
];

export interface SafetySource {
  id: string;
  section: SafetySection;
  topic: string;
  caution: string;
  /** Where it comes from: only what ../shared/domain-brief.md gives, else "Common practice, no source". */
  source: string;
}

const NO_SOURCE = "Common practice, no source";

export const SAFETY_SOURCES: SafetySource[] = [
  {
    id: "styrene",
    section: "fumes",
    topic: "Styrene from heated polystyrene",
    caution: `Cutting EPS and XPS with a hot wire gives off styrene. Limits (United States): OSHA PEL ${STYRENE.oshaPelTwaPpm} ppm (8-hour TWA), ${STYRENE.oshaCeilingPpm} ppm ceiling, ${STYRENE.oshaPeakPpm} ppm peak; NIOSH REL ${STYRENE.nioshRelTwaPpm} ppm TWA, ${STYRENE.nioshStelPpm} ppm STEL; IDLH ${STYRENE.idlhPpm} ppm. Ventilate; large bench cutters may need local exhaust. Use the lowest wire heat that cuts — the wire should never smoke.`,
    source: "OSHA 29 CFR 1910.1000 Table Z-2; NIOSH Pocket Guide to Chemical Hazards (styrene)",
  },
  {
    id: "jurisdiction",
    section: "fumes",
    topic: "Exposure limits differ by jurisdiction",
    caution:
      "The limits on this page are United States values (OSHA, NIOSH). Other countries and states set their own, some lower, some in mg/m³ only: use the limits that apply where you work.",
    source: NO_SOURCE,
  },
  {
    id: "iarc",
    section: "fumes",
    topic: "Styrene and cancer",
    caution: `IARC classifies styrene as probably carcinogenic to humans (Group ${STYRENE.iarcGroup}, ${STYRENE.iarcYear}). Keep exposure low even below the limits.`,
    source: `IARC Monographs volume 121 (${STYRENE.iarcYear})`,
  },
  {
    id: "overheat",
    section: "fumes",
    topic: "Carbon monoxide from an overheated wire",
    caution:
      "A wire run too hot, or left standing in the cut, burns the foam instead of melting it: smoke, carbon monoxide and more styrene. Turn the heat down until the wire cuts without smoke, and keep the ventilation on.",
    source: NO_SOURCE,
  },
  {
    id: "flame-retardant",
    section: "fumes",
    topic: "Flame retardants break down too",
    caution:
      "Flame-retardant grades give off breakdown products of the retardant when heated, as well as styrene. Treat their fumes like styrene's: ventilate, lowest heat that cuts, and read the grade's safety data sheet.",
    source: NO_SOURCE,
  },
  {
    id: "pu",
    section: "fumes",
    topic: "Never hot-wire polyurethane",
    caution: `Above about ${PU_DECOMPOSES_ABOVE_C} °C polyurethane gives off isocyanates, amines, hydrogen cyanide and carbon monoxide. Route or carve PU foam, including high-density sign foam.`,
    source: "American Chemistry Council, Center for the Polyurethanes Industry: thermal degradation guidance",
  },
  {
    id: "pir-pvc",
    section: "fumes",
    topic: "Never hot-wire PIR or PVC foam either",
    caution:
      "Polyisocyanurate (PIR) and PVC foams are not hot-wired, like polyurethane: heated, PIR gives off isocyanates and hydrogen cyanide, PVC hydrogen chloride. Saw, route or carve them, with dust extraction.",
    source: NO_SOURCE,
  },
  {
    id: "epp",
    section: "fumes",
    topic: "EPP needs a hotter wire",
    caution: `Expanded polypropylene (EPP) can be hot-wired, but polypropylene melts at about ${PP_MELTS_C.min}–${PP_MELTS_C.max} °C, so it needs more heat than EPS. Raise the heat step by step, stop short of smoke, and ventilate as for EPS.`,
    source: `${NO_SOURCE} (Blockyard's trade brief gives the melting range without one)`,
  },
  {
    id: "burns",
    section: "wire",
    topic: "Hot-wire burns",
    caution: `The wire runs at ${WIRE.minC}–${WIRE.maxC} °C and long wires carry tens of volts. Never leave a hot wire unattended.`,
    source: "Common practice; the cutter maker's manual",
  },
  {
    id: "supply",
    section: "wire",
    topic: "Power the wire through an isolating transformer",
    caution:
      "Feed the wire from an isolating (safety) transformer or an extra-low-voltage supply — never from an autotransformer (variac) alone: it does not separate the wire from the mains, so a bare wire can sit at mains voltage. Earth (ground) the frame and the supply's metal case, and run the cutter on a circuit with residual-current protection (RCD / GFCI).",
    source: `${NO_SOURCE}; your electrical code and a licensed electrician decide`,
  },
  {
    id: "lockout",
    section: "wire",
    topic: "Lock out before changing the wire",
    caution:
      "Switch off and lock out the wire's supply before changing, re-tensioning or cleaning the wire, and let it cool. Wear eye protection while cutting and tensioning: a wire under tension can snap and whip.",
    source: NO_SOURCE,
  },
  {
    id: "dust",
    section: "dust",
    topic: "Extract dust at the tool",
    caution:
      "Sanding, rasping and routing foam make fine dust that hangs in the air. Extract it at the tool (a shroud and dust extractor, or local exhaust), and wear a respirator rated for fine dust where extraction is not enough.",
    source: NO_SOURCE,
  },
  {
    id: "combustible-dust",
    section: "dust",
    topic: "Combustible dust: keep it from settling",
    caution:
      "Fine plastic dust that settles in layers can burn, and explode when it is stirred into a cloud. Clean floors, ledges and machines often with a vacuum made for the purpose — not compressed air or dry sweeping — and empty collectors before they fill. NFPA 652 (fundamentals of combustible dust) and NFPA 654 (combustible particulate solids) set out the hazard analysis, housekeeping and dust collection a shop needs.",
    source: `${NO_SOURCE} (NFPA 652 and 654 are named as the standards to read, not checked against their text)`,
  },
  {
    id: "scrap-fire",
    section: "fire",
    topic: "Scrap catches fire",
    caution:
      "A hot wire, or scrap that touched it, can set shavings, dust and offcuts alight. Keep loose scrap away from the cutter, empty scrap bins often, and never leave a hot wire unattended. Keep a fire extinguisher suited to plastics at hand by the cutter, and know how to cut its power.",
    source: NO_SOURCE,
  },
  {
    id: "pentane",
    section: "fire",
    topic: "Pentane from fresh foam",
    caution: `Fresh EPS off-gases pentane, which can reach flammable levels in closed storage. Pentane burns in air from about ${PENTANE_LEL_PCT} % by volume (its lower explosive limit). Store fresh blocks ventilated, away from ignition sources, and do not hot-wire freshly moulded blocks in a closed room.`,
    source: `The material's safety data sheet (SDS); the ${PENTANE_LEL_PCT} % figure: ${NO_SOURCE.toLowerCase()}`,
  },
  {
    id: "nfpa13",
    section: "storage",
    topic: "Fire load of stored foam",
    caution:
      "Foam burns, even flame-retardant grades. Exposed expanded plastics are Group A, the highest storage hazard class for sprinkler design — and cartoned foam is Group A too.",
    source: `NFPA 13, Standard for the Installation of Sprinkler Systems (commodity classification); that cartoned foam is Group A too: ${NO_SOURCE.toLowerCase()}`,
  },
  {
    id: "ifc",
    section: "storage",
    topic: "High-piled storage",
    caution: `Storage above ${HIGH_PILED.generalFt} ft is high-piled, and more than ${HIGH_PILED.permitAreaFt2} ft² of it needs a permit. For Group A plastics such as foam the height is ${HIGH_PILED.groupAPlasticsFt} ft where the fire code official requires it. Local editions differ: ask your fire authority.`,
    source: `International Fire Code (2018), chapter 32: High-piled combustible storage; that the ${HIGH_PILED.groupAPlasticsFt} ft height applies where the fire code official requires it: ${NO_SOURCE.toLowerCase()}`,
  },
];

export const DEFER =
  "These are cautions, not rules: follow your local codes and fire authority, the material's safety data sheet and licensed practice.";
