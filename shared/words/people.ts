/**
 * Who a page speaks to. The listener's own pages say "you"; staff pages speak of the listener in the
 * third person. Every text that differs by reader is written here once for each.
 */
export type Reader = 'listener' | 'staff'

export const caseAnswerWords: Record<Reader, { description: string; use: string; seat: string; bothers: string; constraints: string; budget: string }> = {
  listener: {
    description: 'What you hear and want',
    use: 'What you listen to, or use the room for',
    seat: 'The seat that matters most',
    bothers: 'What bothers you',
    constraints: "What you can't change",
    budget: 'Budget',
  },
  staff: {
    description: 'What they hear and want',
    use: 'What they listen to, or use the room for',
    seat: 'The seat that matters most',
    bothers: 'What bothers them',
    constraints: "What they can't change",
    budget: 'Budget',
  },
}

/**
 * Who the side panel of the account pages speaks to: sign-up is for listeners, an invitation for staff;
 * sign-in and "forgot password" serve everyone, unless the page knows whose account it is.
 */
export type AccountReader = Reader | 'everyone'

/** The side panel of the sign-in, sign-up and password pages: listeners get the product, staff the desk, everyone both. */
export const accountStory: Record<AccountReader, { headline: string; lead: string; points: string[] }> = {
  everyone: {
    headline: 'One desk for rooms that sound better',
    lead:
      'Listeners describe a room and what they hear in it; advisors answer with the room already checked, and a ' +
      'treatment plan comes back in plain words.',
    points: [
      'Listeners: open a case about a room, send photos and measurements, follow the answers here and by e-mail.',
      'Advisors: work the queue with the bass modes, reflections and setup checks worked out before you start.',
      'Supervisors: see waiting times against the targets, spread the work and look after the team.',
    ],
  },
  listener: {
    headline: 'Advice for the room you listen in',
    lead:
      'Roomwright is an advisory desk for listening rooms. Tell us about your room (its size, where the speakers and ' +
      'your chair are, what the walls and floor are made of) and an advisor works out how sound behaves in it.',
    points: [
      'Bass notes that boom or go missing, traced to the shape of your room.',
      'Echoes off nearby walls that blur the stereo image, found surface by surface.',
      'A plan in plain words: what to move, what to add, and what it should change.',
    ],
  },
  staff: {
    headline: 'The Roomwright advisory desk',
    lead:
      'Your team answers listeners about their rooms. Each case arrives with the room already checked: its modes, ' +
      'the reflections at the seat and the setup flags, so you can start from the findings.',
    points: [
      'A queue ordered by what needs an answer first, with the room checks on every case.',
      'Replies and snippets beside the analysis, and a plan editor that predicts what each treatment changes.',
      'Safety notes on fixings, fire ratings and loud test signals travel with every plan.',
    ],
  },
}

export const roleWithArticle: Record<'listener' | 'advisor' | 'supervisor', string> = {
  listener: 'a listener',
  advisor: 'an advisor',
  supervisor: 'a supervisor',
}

/** The name of each role, as a chip or a column shows it. */
export const roleLabels: Record<'listener' | 'advisor' | 'supervisor', string> = {
  listener: 'Listener',
  advisor: 'Advisor',
  supervisor: 'Supervisor',
}
