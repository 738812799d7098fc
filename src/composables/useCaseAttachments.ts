import { ApiRequestError } from '../api/client'
import { precheckFile, uploadErrorMessage, uploadFile } from '../api/files'
import { useCasesStore } from '../stores/cases'

/**
 * Attaching a file to a message: the file is uploaded to the open case first, then the message names it.
 * Problems go to `onProblem` in plain words; the answer is null then.
 */
export function useCaseAttachments(onProblem: (message: string) => void) {
  const cases = useCasesStore()
  return async function attach(file: File): Promise<{ id: string; name: string } | null> {
    const id = cases.detail.data?.id
    if (!id) return null
    const problem = precheckFile(file)
    if (problem) {
      onProblem(problem)
      return null
    }
    try {
      const f = await uploadFile(id, file)
      void cases.refreshFiles()
      return { id: f.id, name: f.name }
    } catch (error) {
      onProblem(error instanceof ApiRequestError ? uploadErrorMessage(error, file.name) : `${file.name} was not attached.`)
      return null
    }
  }
}
