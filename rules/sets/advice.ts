import { advise, notApplicable } from '../findings'
import { corded, looped } from '../record'
import type { CoveringRecord } from '../record'
import type { Clause, ClauseContext, Finding } from '../types'

// Advice shared by several rule sets. Advice never passes or fails a covering.

function furnitureAway(r: CoveringRecord, cx: ClauseContext): Finding {
  if (r.climbableFurnitureNearby === true) {
    return advise(
      cx,
      'climbableFurnitureNearby',
      true,
      'A cot, bed, high chair or other furniture a child can climb stands near this window.',
      'Move cots, beds, high chairs and other climbable furniture away from the window and its cords.',
    )
  }
  if (r.climbableFurnitureNearby === false) {
    return advise(
      cx,
      'climbableFurnitureNearby',
      false,
      'No climbable furniture was recorded near the window.',
      'Keep cots, beds and climbable furniture away from the window when the room is rearranged.',
    )
  }
  return advise(
    cx,
    'climbableFurnitureNearby',
    null,
    'Not recorded whether climbable furniture stands near the window.',
    'Look for cots, beds, high chairs or other climbable furniture near the window and move them away.',
  )
}

export const furnitureAwayClause: Clause = {
  id: 'advice.furniture-away',
  title: 'Keep climbable furniture away from corded windows',
  kind: 'advice',
  source: {
    document: 'Health Canada, NSAI and Hackney Trading Standards consumer advice on corded window coverings',
    section: 'placing cots, beds and furniture away from windows',
  },
  basis: 'published',
  appliesTo: { description: 'every covering with reachable cords, inner lift cords included', controls: corded, innerCordProducts: true },
  thresholds: [],
  evaluate: furnitureAway,
}

function cordlessForChildren(r: CoveringRecord, cx: ClauseContext): Finding {
  if (r.childrensRoom === true || r.premises === 'childcare') {
    return advise(
      cx,
      r.childrensRoom === true ? 'childrensRoom' : 'premises',
      r.childrensRoom === true ? true : r.premises,
      'This covering has an operating cord in a room used by young children.',
      'Prefer a cordless, wand-operated or motorised covering here.',
    )
  }
  return notApplicable(cx, 'Not recorded as a child\'s room or childcare premises.')
}

export const cordlessForChildrenClause: Clause = {
  id: 'advice.cordless-for-children',
  title: 'Prefer cordless coverings in children\'s rooms and childcare',
  kind: 'advice',
  source: { document: 'CPSC and Health Canada consumer advice on window covering cords', section: 'choosing cordless products for children\'s rooms' },
  basis: 'published',
  appliesTo: { description: 'coverings with an operating cord in a child\'s room or in childcare premises', controls: corded },
  thresholds: [],
  evaluate: cordlessForChildren,
}

function easeTension(r: CoveringRecord, cx: ClauseContext): Finding {
  if (r.tensionDevice !== true) return notApplicable(cx, 'No tension device is recorded as fitted.')
  const ease = cx.t.easeMm
  return advise(
    cx,
    'tensionDevice',
    true,
    `Fix the tension device where the loop is just taut, then ease it back about ${ease} mm towards the headrail so the loop runs freely without going slack.`,
    null,
  )
}

export const easeTensionClause: Clause = {
  id: 'advice.ease-tension',
  title: 'Set a tension device taut, then ease it about 10 mm',
  kind: 'advice',
  source: { document: 'common practice', section: 'fitting a tension device' },
  basis: 'common_practice',
  appliesTo: { description: 'chain and cord loops held by a tension device', controls: looped },
  thresholds: [{ name: 'easeMm', value: 10, unit: 'mm', note: 'about; enough for the loop to run freely' }],
  evaluate: easeTension,
}

function screwFixings(r: CoveringRecord, cx: ClauseContext): Finding {
  if (r.tensionDevice !== true && r.cleat !== true) return notApplicable(cx, 'No tension device or cleat is recorded as fitted.')
  if (r.deviceFixing === 'adhesive') {
    return advise(cx, 'deviceFixing', r.deviceFixing,
      'The device is stuck on with adhesive: adhesive can let go under a child\'s pull.',
      'Refix it with screws into solid material (timber, plugs in masonry, anchors in plasterboard) and repeat the pull test.')
  }
  return advise(
    cx,
    r.deviceFixing ? 'deviceFixing' : r.tensionDevice === true ? 'tensionDevice' : 'cleat',
    r.deviceFixing ?? true,
    'Tension devices and cleats hold only as well as their fixings.',
    'Fix them with screws into solid material (timber, plugs in masonry, anchors in plasterboard); never with adhesive.',
  )
}

export const screwFixingsClause: Clause = {
  id: 'advice.screw-fixings',
  title: 'Screw devices into solid material, never glue them',
  kind: 'advice',
  source: { document: 'common practice', section: 'fixing tension devices and cleats' },
  basis: 'common_practice',
  appliesTo: { description: 'coverings with a tension device or a cleat', controls: corded },
  thresholds: [],
  evaluate: screwFixings,
}

function stopBead(_r: CoveringRecord, cx: ClauseContext): Finding {
  return advise(
    cx,
    'control',
    'chain_loop',
    'A stop bead on the chain stops the fabric rolling too far; it does not protect a child.',
    'Do not count a stop bead as a safety device; judge the chain by the other clauses.',
  )
}

export const stopBeadClause: Clause = {
  id: 'advice.stop-bead',
  title: 'A chain stop bead is not a safety device',
  kind: 'advice',
  source: { document: 'common practice', section: 'chain stop beads' },
  basis: 'common_practice',
  appliesTo: { description: 'coverings worked by a bead chain loop', controls: ['chain_loop'] },
  thresholds: [],
  evaluate: stopBead,
}

/** The advice clauses every rule set carries, in display order. */
export const sharedAdvice: readonly Clause[] = [
  furnitureAwayClause,
  cordlessForChildrenClause,
  easeTensionClause,
  screwFixingsClause,
  stopBeadClause,
]
