/**
 * The caution every finding about brakes, suspension or engine limits carries: the data shows a symptom, not a diagnosis.
 * The data shows a symptom; people with the part in their hands decide what it means.
 */
export const CAUTION_TEXT =
  "The data shows a symptom, not a diagnosis. Inspect the part before the bike goes out again. " +
  "Setup and engine work follows the manufacturer's service data, the championship's technical rules " +
  "and qualified mechanics.";
