/**
 * The cautions every protocol description carries (Markdown). Test rides are physical
 * efforts and some tests change the bike, so the notebook says so where it describes them.
 */
export const PROTOCOL_CAUTIONS = [
  '**Before you ride this protocol**',
  '',
  '- Secure the bike on the trainer (quick-release or thru-axle closed, trainer on a level floor) before any effort.',
  '- Effort levels are the rider\'s own responsibility: stop when unwell, and choose targets the rider can hold safely.',
  '- A drivetrain changed for a test (chainrings, crank, pedals, shifting) is restored and checked by a qualified mechanic before the bike is ridden on the road.',
  '- The results are measurements with uncertainty, compared against a reference that has its own tolerance. They are not a certification of any device.',
].join('\n');

/** A protocol description followed by {@link PROTOCOL_CAUTIONS}. */
export function protocolNote(heading: string, lines: readonly string[]): string {
  return [`## ${heading}`, '', ...lines, '', PROTOCOL_CAUTIONS].join('\n');
}
