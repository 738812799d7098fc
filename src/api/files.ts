import type { CaseFile } from '../../shared/schemas/case'
import type { MeasurementAnalysisResult } from '../../shared/signal'
import { ApiRequestError, api, upload } from './client'

export type { CaseFile }
export type AnalysisStatus = NonNullable<CaseFile['analysis']>['status']

/** Photos up to 15 MB (JPEG, PNG, WebP); measurements up to 50 MB (WAV or frequency-response text). */
export const PHOTO_TYPES = ['image/jpeg', 'image/png', 'image/webp'] as const
export const PHOTO_MAX_BYTES = 15 * 1024 * 1024
export const MEASUREMENT_MAX_BYTES = 50 * 1024 * 1024
export const ACCEPTED_FILES = '.jpg,.jpeg,.png,.webp,.wav,.wave,.txt,.csv,.tsv,image/jpeg,image/png,image/webp,audio/wav,audio/x-wav,text/plain,text/csv'

export async function listFiles(caseId: string): Promise<CaseFile[]> {
  return (await api.get<{ files: CaseFile[] }>(`/api/cases/${encodeURIComponent(caseId)}/files`)).files
}

/** Sends one file as multipart field `file`, reporting progress as 0…1. */
export function uploadFile(caseId: string, file: File, onProgress?: (fraction: number) => void, signal?: AbortSignal): Promise<CaseFile> {
  const form = new FormData()
  form.append('file', file, file.name)
  return upload<CaseFile>(`/api/cases/${encodeURIComponent(caseId)}/files`, form, {
    signal,
    onProgress: (loaded, total) => onProgress?.(total > 0 ? loaded / total : 0),
  })
}

export const fileUrl = (fileId: string) => `/api/files/${encodeURIComponent(fileId)}`
export const thumbnailUrl = (fileId: string) => `/api/files/${encodeURIComponent(fileId)}/thumbnail`

/** The analysis result of a measurement file, once its analysis is done. */
export function analysisResult(file: CaseFile): MeasurementAnalysisResult | null {
  return file.analysis?.status === 'done' && file.analysis.result ? (file.analysis.result as MeasurementAnalysisResult) : null
}

/** A check in the browser before sending, so a listener hears at once why a file will not go. */
export function precheckFile(file: File): string | null {
  const isPhoto = file.type.startsWith('image/') || /\.(jpe?g|png|webp|heic)$/i.test(file.name)
  if (isPhoto) {
    if (/\.heic$/i.test(file.name) || file.type === 'image/heic') return `"${file.name}" is a HEIC photo. Save it as JPEG first (most phones can share a photo as JPEG).`
    if (file.size > PHOTO_MAX_BYTES) return `"${file.name}" is ${megabytes(file.size)}; photos can be at most 15 MB.`
    return null
  }
  if (file.size > MEASUREMENT_MAX_BYTES) return `"${file.name}" is ${megabytes(file.size)}; measurement files can be at most 50 MB.`
  if (!/\.(wav|wave|txt|csv|tsv)$/i.test(file.name)) return `"${file.name}" is not a photo (JPEG, PNG, WebP), a WAV impulse response or a frequency-response text file.`
  return null
}

export function megabytes(bytes: number): string {
  if (bytes < 1024 * 1024) return `${Math.max(1, Math.round(bytes / 1024))} kB`
  return `${(bytes / (1024 * 1024)).toFixed(1)} MB`
}

/** Plain words for a refused upload. */
export function uploadErrorMessage(error: ApiRequestError, name: string): string {
  if (error.status === 413) return error.code === 'unexpected_response' ? `"${name}" is too large: photos can be at most 15 MB, measurements 50 MB.` : error.message
  if (error.status === 415) return error.code === 'unexpected_response' ? `"${name}" is not a file type we take: send a JPEG, PNG or WebP photo, a WAV or a frequency-response text file.` : error.message
  if (error.status === 0) return error.message
  if (error.status >= 500) return `"${name}" could not be stored because of a problem on our side. Try again in a moment.`
  return error.message
}
