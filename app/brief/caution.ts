/** The caution shown by the app, the CLI and the brief (common practice for drop planning). */
export const CAUTION_TEXT =
  'Planning aid only. Releasing objects from aircraft is regulated: follow local aviation rules, ' +
  'obtain airspace authorisation and landowner permission, work to licensed practice, and keep ' +
  'people clear of the hazard area during every release.';
