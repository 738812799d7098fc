import { computed, onBeforeUnmount, ref, watch, type Ref } from 'vue'
import type { CaseStatus, MessageInput } from '../../shared/schemas/case'
import { ApiRequestError } from '../api/client'
import { caseErrorMessage } from '../api/cases'
import { useCasesStore } from '../stores/cases'
import { useCaseAttachments } from './useCaseAttachments'
import { useCaseLive } from './useLive'
import { useShownWhileSet } from './useShownWhileSet'

export interface CaseNotice {
  text: string
  type: 'error' | 'success'
}

/**
 * One open case, as both the listener's case page and the advisor's workspace hold it: the store opened
 * (and closed on leaving), the live channel, and the actions both pages offer — move the status, send a
 * message with attached files — with their busy state, their problems and their notices.
 */
export function useOpenCase(
  caseId: Ref<string>,
  words: {
    /** said when a move fails without a reason from the server */
    moveFailed: string
    /** said when a message was not sent without a reason from the server */
    sendFailed: string
    /** said after a move to these statuses went through */
    moved?: Partial<Record<CaseStatus, string>>
    /** the listener writes replies only: no internal notes, no questions */
    repliesOnly?: boolean
    /** the case is known to be sent (the workspace): its triage is asked for at once, beside it */
    sent?: boolean
    /** also run when the page opens (another) case */
    onOpen?: (id: string) => void
  },
) {
  const cases = useCasesStore()
  watch(
    caseId,
    (id) => {
      void cases.open(id, { sent: words.sent })
      words.onOpen?.(id)
    },
    { immediate: true },
  )
  onBeforeUnmount(() => cases.close(caseId.value))
  const live = useCaseLive(caseId)

  const busy = ref<CaseStatus | null>(null)
  const notice = ref<CaseNotice | null>(null)
  const noticeOpen = useShownWhileSet(notice)

  async function move(to: CaseStatus): Promise<void> {
    busy.value = to
    notice.value = null
    try {
      await cases.moveTo(to)
      const said = words.moved?.[to]
      if (said) notice.value = { type: 'success', text: said }
    } catch (error) {
      notice.value = { type: 'error', text: error instanceof ApiRequestError ? caseErrorMessage(error) : words.moveFailed }
    } finally {
      busy.value = null
    }
  }

  /** what went wrong with the last message or attachment, shown above the conversation */
  const sendProblem = ref<string | null>(null)
  const attach = useCaseAttachments((message) => (sendProblem.value = message))

  async function send(input: MessageInput): Promise<boolean> {
    sendProblem.value = null
    try {
      await cases.sendMessage(words.repliesOnly ? { body: input.body, fileIds: input.fileIds } : input)
      live.stoppedTyping()
      return true
    } catch (error) {
      sendProblem.value = error instanceof ApiRequestError ? caseErrorMessage(error) : words.sendFailed
      return false
    }
  }

  return { cases, live, detail: computed(() => cases.detail.data), busy, notice, noticeOpen, move, sendProblem, attach, send }
}
