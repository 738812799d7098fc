/** The invented demo team and listeners. Password for all: DEMO_PASSWORD (demo database only). */
export const DEMO_PASSWORD = 'roomwright-demo'

export const demoPeople = [
  { email: 'listener@roomwright.test', name: 'Maren Okafor', role: 'listener' },
  { email: 'advisor@roomwright.test', name: 'Teodor Lindqvist', role: 'advisor' },
  { email: 'supervisor@roomwright.test', name: 'Ines Achterberg', role: 'supervisor' },
  { email: 'priya.halvorsen@roomwright.test', name: 'Priya Halvorsen', role: 'advisor' },
  { email: 'jonas.mbeki@roomwright.test', name: 'Jonas Mbeki', role: 'listener' },
  { email: 'clara.vasquez-ito@roomwright.test', name: 'Clara Vasquez-Ito', role: 'listener' },
  { email: 'felix.aduya@roomwright.test', name: 'Felix Aduya', role: 'listener' },
] as const
