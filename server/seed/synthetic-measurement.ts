import * as wavefileModule from 'wavefile'
import { computeRoomAnalysis } from '../../shared/acoustics'
import { butterworthBandpass, filterSos, octaveBands } from '../../shared/signal/bands'
import type { RoomDescription } from '../../shared/acoustics'

const ns = wavefileModule as unknown as { WaveFile?: new () => WaveLike; default?: { WaveFile: new () => WaveLike } }
type WaveLike = { fromScratch(ch: number, sr: number, depth: string, samples: Float64Array | Float64Array[]): void; toBuffer(): Uint8Array }
const WaveFile = (ns.WaveFile ?? ns.default?.WaveFile) as new () => WaveLike

/** A small deterministic generator, so the demo files are the same on every machine. */
function rng(seed: number) {
  let s = seed >>> 0
  return () => {
    s = (s * 1664525 + 1013904223) >>> 0
    return s / 2 ** 32 - 0.5
  }
}

/**
 * A SYNTHETIC impulse response for the demo, made from the engine's own models of the room — not a
 * recording: the direct sound, every first- and second-order image-source reflection at its delay and
 * level (Allen & Berkley), and a diffuse tail per octave band decaying with the band's Eyring
 * reverberation time. Good enough to exercise the measurement analysis with figures that match the
 * room's triage; a listener's real measurement will differ.
 */
export function syntheticImpulseResponse(room: RoomDescription, speakerLabel: string, opts: { sampleRate?: number; seconds?: number; seed?: number } = {}): Uint8Array {
  const sr = opts.sampleRate ?? 48_000
  const n = Math.round((opts.seconds ?? 1.5) * sr)
  const a = computeRoomAnalysis(room)
  const pair = a.reflections.find((p) => p.speaker === speakerLabel) ?? a.reflections[0]
  const random = rng(opts.seed ?? 20261202)
  const out = new Float64Array(n)
  const t0 = Math.round(0.005 * sr) + Math.round((pair.directMs / 1000) * sr)
  out[t0] = 1
  for (const r of [...pair.first, ...pair.second]) {
    const i = t0 + Math.round((r.delayMs / 1000) * sr)
    if (i < n) out[i] += (random() > 0 ? 1 : -1) * 10 ** (r.levelDb / 20)
  }
  // Diffuse tail: band-limited noise per octave, starting after the second-order reflections.
  const tailStart = t0 + Math.round(0.02 * sr)
  for (const band of octaveBands(125, 4000)) {
    const rt = a.reverberation.bands.find((b) => b.hz === band.nominalHz)?.eyring
    if (!rt || !Number.isFinite(rt)) continue
    const noise = new Float64Array(n)
    for (let i = tailStart; i < n; i++) noise[i] = random() * Math.exp((-3 * Math.LN10 * (i - tailStart)) / (rt * sr))
    const filtered = filterSos(noise, butterworthBandpass(band.lowHz, band.highHz, sr))
    for (let i = 0; i < n; i++) out[i] += 0.35 * filtered[i]
  }
  // A measurement's noise floor, about 70 dB below the peak.
  for (let i = 0; i < n; i++) out[i] += random() * 6e-4
  let peak = 0
  for (const v of out) peak = Math.max(peak, Math.abs(v))
  const scaled = out.map((v) => (v / peak) * 0.8)
  const wav = new WaveFile()
  wav.fromScratch(1, sr, '32f', scaled)
  return wav.toBuffer()
}
