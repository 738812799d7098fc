import { getMaterial, PANEL_FLOW_RESISTIVITY } from '../acoustics'
import type { PlanTreatment } from '../schemas/plan'
import { mountingWords, treatmentTypeNames, capitalise } from './names'

export interface ShoppingItem {
  item: string
  /** width × height, and thickness / air gap, in words */
  size: string
  material: string
  mounting: string
  quantity: number
  /** m² of one item's face */
  areaEachM2: number
  areaM2: number
  /** the plan's change ids this line gathers */
  changeIds: string[]
}

/** Identical treatments gathered into one line, with quantities and face areas; totals in m². */
export function shoppingList(treatments: readonly PlanTreatment[]): { items: ShoppingItem[]; totalAreaM2: number; totalCount: number } {
  const lines = new Map<string, ShoppingItem>()
  for (const t of treatments) {
    const w = Math.round(t.width * 100) / 100
    const h = Math.round(t.height * 100) / 100
    const material = t.materialId
      ? getMaterial(t.materialId, 'treatment material').name
      : t.type === 'diffuser'
        ? 'diffuser'
        : `porous absorber, flow resistivity about ${(t.flowResistivity ?? PANEL_FLOW_RESISTIVITY).toLocaleString('en-GB')} Pa·s/m²`
    const depth = t.thickness > 0 ? `, ${Math.round(t.thickness * 1000)} mm${t.type === 'diffuser' ? ' deep' : ' thick'}` : ''
    const gap = t.airGap ? `, ${Math.round(t.airGap * 1000)} mm air gap` : ''
    const size = `${w.toFixed(2)} × ${h.toFixed(2)} m${depth}${gap}`
    const mounting = t.mounting ? mountingWords[t.mounting] ?? t.mounting : ''
    const key = [t.type, size, material, mounting].join('|')
    const line = lines.get(key) ?? { item: capitalise(treatmentTypeNames[t.type] ?? t.type), size, material, mounting, quantity: 0, areaEachM2: w * h, areaM2: 0, changeIds: [] }
    line.quantity += 1
    line.areaM2 += w * h
    line.changeIds.push(t.id)
    lines.set(key, line)
  }
  const items = [...lines.values()]
  return { items, totalAreaM2: items.reduce((s, i) => s + i.areaM2, 0), totalCount: items.reduce((s, i) => s + i.quantity, 0) }
}
