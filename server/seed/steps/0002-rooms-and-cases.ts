import { playCase, type DemoCaseScript } from '../case-script'
import cases from '../data/cases-0002.json'

/**
 * Demo rooms and cases across the lifecycle, written through the same services people use: the table is
 * data/cases-0002.json (Maren's near-square living room, just sent in, and her attic draft; Jonas's study in
 * review with Teodor; Clara's basement cinema waiting on her; Felix's garden studio, plan sent).
 */
export async function seed(): Promise<void> {
  for (const script of cases as unknown as DemoCaseScript[]) await playCase(script)
}
