/** Reply snippets for the demo advisors: the team's shared first answers, in our own words. */
export const demoSnippets = [
  {
    title: 'Thanks — first look at the room',
    body: 'Hello {{listener.name}}, thank you for the clear description of {{room.name}}. I have looked at the room check: its lowest room mode sits at {{room.firstAxialHz}}, and below about {{room.schroederHz}} the room, not the speakers, shapes the bass at your seat. I will come back with concrete positions shortly.\n\n{{advisor.name}}',
  },
  {
    title: 'Please measure each speaker from the seat',
    body: 'Could you measure each speaker on its own from your main seat (left, then right) and add both files here? The measuring guide on this site shows how. Please keep the level moderate and protect your hearing.',
  },
  {
    title: 'Photos of every wall',
    body: 'A photo of each wall, taken from the opposite corner, would help me see the furniture, windows and doors of {{room.name}}. You can add them under "Photos and measurements".',
  },
  {
    title: 'Seat off the room centre',
    body: 'Your seat is close to the middle of the room ({{room.dimensions}}), where several bass modes cancel. Moving it towards 38 % of the length from the front wall is a usual starting point (common practice) and costs nothing; try it before any treatment.',
  },
  {
    title: 'Cautions before fitting panels',
    body: 'Before fitting anything: heavy panels and ceiling clouds need fixings rated for their weight, porous materials and fabrics must meet your local fire rules, and any electrical work belongs to a qualified person. Your local building codes come first.',
  },
  {
    title: 'Re-measure after the change',
    body: 'When the change is in place, please measure again from the same seat, at the same level and with the same microphone position, and add the file here: I will put it beside the prediction in your plan.',
  },
] as const
