/**
 * The cautions of DESIGN.md, "Safety and privacy": short, calm, and deferring to the licensed
 * clinician and local regulations. Every page that shows measures carries `MEASURES_CAUTION`; plan
 * pages carry `PLAN_CAUTION` from `contracts/plans`; pain scores and plan alerts carry
 * `PAIN_CAUTION`; the athlete's assessment page (where they run and film) carries `FILMING_CAUTION`; saved stills draw `STILL_CAUTION_LINE` (`contracts/sharing`). Show them with `CautionNote` (`shared/caution-note/`), styled as information.
 */
export const MEASURES_CAUTION =
  "These figures support, and do not replace, a licensed clinician's judgement. Stop an exercise that causes sharp or worsening pain; follow local regulations.";

/** Beside pain scores and plan alerts (intake, roster, athlete profile, Plan tab). */
export const PAIN_CAUTION =
  "Pain scores and plan alerts point to what to look at; they do not replace a licensed clinician's examination or judgement. Sharp or worsening pain means stop and see a clinician; follow local regulations.";

/** On the owner's erasure card and dialog. */
export const ERASURE_CAUTION =
  'Erasure cannot be undone. Before erasing, check which records local regulations require the clinic to keep; invoices and payments stay, under a reference instead of the name.';

/** Beside the clip retention setting. */
export const RETENTION_CAUTION =
  'Check how long local regulations require clinical records to be kept before removing clips. Nothing is removed until you confirm the list.';

/** On the athlete's assessment page, where they are asked to run and film it. */
export const FILMING_CAUTION =
  'Film only running your clinician has cleared you for, at a comfortable pace. Stop if it causes sharp or worsening pain and contact your clinician.';
