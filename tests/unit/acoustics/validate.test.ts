import { describe, expect, it } from 'vitest'
import { assertOpening, assertPointInRoom, assertRoom } from '../../../shared/acoustics'

const room = { length: 6.35, width: 4, height: 2.5 }

describe('validation errors name the value and the physical reason', () => {
  it('non-positive and non-finite dimensions', () => {
    expect(() => assertRoom({ length: 0, width: 4, height: 2.5 })).toThrow(new RangeError('room length must be greater than zero: got 0 m'))
    expect(() => assertRoom({ length: 6, width: -4, height: 2.5 })).toThrow('room width must be greater than zero: got -4 m')
    expect(() => assertRoom({ length: 6, width: 4, height: Number.POSITIVE_INFINITY })).toThrow('room height must be a finite number: got Infinity')
  })
  it('points outside the room', () => {
    expect(() => assertPointInRoom(room, { x: 7.2, y: 1, z: 1 }, 'seat')).toThrow(new RangeError('seat lies outside the room: x = 7.2 m > length 6.35 m'))
    expect(() => assertPointInRoom(room, { x: 1, y: -0.5, z: 1 }, 'speaker')).toThrow('speaker lies outside the room: y = -0.5 m < 0')
    expect(() => assertPointInRoom(room, { x: 1, y: 1, z: Number.NaN }, 'seat')).toThrow('seat z must be a finite number: got NaN')
    expect(() => assertPointInRoom(room, { x: 6.35, y: 0, z: 2.5 })).not.toThrow()
  })
  it('openings off their wall', () => {
    expect(() => assertOpening(room, { wall: 'front', kind: 'door', from: 3.5, to: 4.5, bottom: 0, top: 2 })).toThrow("opening lies off the front wall: span 3.5–4.5 m exceeds the wall's width 4 m (y)")
    expect(() => assertOpening(room, { wall: 'left', kind: 'door', from: 1, to: 2, bottom: 0, top: 2.7 })).toThrow(/height 0–2.7 m exceeds the room height 2.5 m/)
    expect(() => assertOpening(room, { wall: 'left', kind: 'door', from: 2, to: 1, bottom: 0, top: 2 })).toThrow(/from = 2 m must be less than to = 1 m/)
    expect(() => assertOpening(room, { wall: 'ceiling', kind: 'skylight', from: 1, to: 2, bottom: 0, top: 1 })).toThrow(/must sit in a wall/)
    expect(() => assertOpening(room, { wall: 'left', kind: 'window', from: 5, to: 6.35, bottom: 0.9, top: 2.1 })).not.toThrow()
  })
})
