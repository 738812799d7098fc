/** Fixed texts of every plan and report. */

/** How to measure again after the treatment, so before and after compare. */
export const FOLLOW_UP_MEASURING: { title: string; steps: string[] } = {
  title: 'Measuring again after the changes',
  steps: [
    'Put the microphone at ear height at the main seat, where your head is when you listen, pointing straight up at the ceiling. Use the same spot and height as for your first measurement; mark it with tape.',
    'Play the measurement signal at a moderate level: about as loud as normal conversation at the seat. Louder does not make the measurement better, and long loud sweeps can harm hearing.',
    'Measure the left speaker alone, then the right speaker alone, then both together. Keep the doors, curtains and furniture as they will be when you listen.',
    'Keep the room quiet while measuring: no fridge, fan or traffic noise if you can help it.',
    'Upload the files to this case (WAV impulse responses or frequency-response text files). We compare them with the first measurements and with what this plan predicted.',
  ],
}

/** Safety and scope notes printed with every plan. */
export const CAUTIONS: { title: string; text: string }[] = [
  { title: 'Fixings', text: 'Use fixings rated for the load and for the wall or ceiling they go into. Overhead items (ceiling clouds) and heavy bass traps need particular care: check the ceiling structure and use rated anchors, never adhesive alone.' },
  { title: 'Fire', text: 'Porous materials and fabrics burn differently. Choose products whose fire rating meets your local building code, and keep them clear of heaters, lamps and flues.' },
  { title: 'Hearing', text: 'Measure at a moderate level. Loud test signals, and long sessions at high levels, can damage hearing.' },
  { title: 'Electrical work', text: 'Moving sockets, lighting or cabling behind panels is work for a qualified electrician.' },
  { title: 'Guidance', text: 'This plan is guidance from an acoustic model and an advisor\'s judgement. It defers to local building codes and to licensed professional practice where they apply.' },
]
