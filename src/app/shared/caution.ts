/**
 * The caution every page that shows measures carries (DESIGN.md, "Safety and privacy"); plan
 * pages carry `PLAN_CAUTION` from `contracts/plans`, which says the same for a plan.
 */
export const MEASURES_CAUTION =
  "These figures support, and do not replace, a licensed clinician's judgement. Stop an exercise that causes sharp or worsening pain; follow local regulations.";
