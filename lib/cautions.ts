// Short safety cautions shown where risky work is recorded (REFERENCES.md §7, in our own words).
// They are reminders, not instructions: the maker's manual, local codes and licensed practice
// decide. <Caution> (components/ui/caution.tsx) always prints CAUTION_DEFERRAL under the text;
// anywhere else, use cautionLine() so the deferral is never dropped.

export const CAUTION_KEYS = ["torque", "brakes", "fuel", "hot_oil", "used_oil", "lifting"] as const;
export type CautionKey = (typeof CAUTION_KEYS)[number];

export type CautionText = { title: string; text: string; source: string };

export const CAUTION_DEFERRAL = "Follow the maker's service manual, local codes and licensed practice.";

export const CAUTIONS: Readonly<Record<CautionKey, CautionText>> = {
  torque: {
    title: "Torque wrench",
    text: "Pull steadily at the handle's grip line and come up to final torque slowly, with a wrench that is in calibration.",
    source: "Tool accuracy: ISO 6789-1/-2:2017 (±4 % for most classes, from memory, unverified); technique: common trade practice.",
  },
  brakes: {
    title: "Brake fluid",
    text: "Keep brake fluid in its original, tightly closed container and never reuse the container. Wipe spills at once: glycol fluid harms paint.",
    source: "FMVSS 116 label text, 49 CFR 571.116 S5.2.2.2; paint damage from memory, unverified.",
  },
  fuel: {
    title: "Fuel system open",
    text: "No sparks, flames or smoking nearby. Keep the bay ventilated and drain fuel only into approved, closed containers.",
    source: "Common practice, no published source listed.",
  },
  hot_oil: {
    title: "Hot engine and oil",
    text: "Let the engine and exhaust cool before you touch them, and wear gloves when draining warm oil.",
    source: "ISO 13732-1 (burn thresholds for contact with hot surfaces).",
  },
  used_oil: {
    title: "Used oil and filters",
    text: "Store used oil in sound, closed containers marked \u201cUsed Oil\u201d and clean up spills straight away. Puncture and hot-drain oil filters before recycling.",
    source: "40 CFR 279.22 (used-oil containers and spills); 40 CFR 261.4(b)(13) and EPA530-F-92-010 (filters).",
  },
  lifting: {
    title: "Lifting",
    text: "Never work under a machine held up only by a jack: support it on rated stands on firm, level ground.",
    source: "ASME PASE (wording from memory, unverified).",
  },
};

/** The caution as one line with its deferral, for places without the <Caution> box. */
export function cautionLine(key: CautionKey): string {
  return `${CAUTIONS[key].text} ${CAUTION_DEFERRAL}`;
}
