/**
 * The demo scenario, loaded by the Nitro task `db:seed` (`npm run seed`; server/tasks/db/seed.ts)
 * into the database the server is configured with, after its migrations. Idempotent: a second run
 * changes nothing. Runs inside the server so it uses the app's own services (the frozen worksheet
 * content, signatures, installations) and the sign-in library's own password hashing.
 *
 * Everything here is invented for the demo: the operator (Fellmoor Regional), its aircraft
 * types (Tarnwing 46, Tarnwing 72), registrations in the unallocated QX- block, part numbers,
 * specifications, data references and people.
 */
import type { Transaction } from 'sequelize'
import { ENGINE_VERSION } from '../../shared/gas/version'
import type { Pressure, Temperature } from '../../shared/gas/types'
import { DEFAULT_PREFERENCES, type Role } from '../../shared/types/user'
import type { SpecificationDto } from '../../shared/types/registers'
import { specificationChargeTarget, specificationPressure } from '../../shared/utils/specification-target'
import { assessWorksheetReading } from '../../shared/utils/worksheet-results'
import { gaugeAccuracy } from '../../shared/utils/tool-accuracy'
import { cycleCheckLeakRate } from '../../shared/utils/cycle-check'
import type { ToolSnapshot, WorksheetContent, WorksheetResults } from '../../shared/types/worksheet'
import { appendAudit, baselineRecords } from '../database/audit-chain'
import { rebuildTrends } from './unit-trends'
import { install } from './accumulators'
import { createSignature } from './signatures'
import { frozenContent } from './worksheets'
import {
  Accumulator,
  Authorisation,
  Aircraft,
  CycleCheck,
  Operator,
  Specification,
  SpecificationTablePoint,
  Station,
  Tool,
  User,
  Worksheet,
} from '../models'

export const DEMO_PASSWORD = 'chargewell-demo'

interface DemoUser {
  email: string
  name: string
  roles: Role[]
  authorisationNumber: string | null
  /** Granted only these stations and operators (by name); every one when left out. */
  stations?: string[]
  operators?: string[]
}

const DEMO_USERS: DemoUser[] = [
  { email: 'technician@chargewell.test', name: 'Rowan Hale', roles: ['technician'], authorisationNumber: 'FMR-T-0412' },
  { email: 'inspector@chargewell.test', name: 'Imke Dorsey', roles: ['inspector'], authorisationNumber: 'FMR-I-0107' },
  { email: 'engineer@chargewell.test', name: 'Sol Varga', roles: ['engineer'], authorisationNumber: null },
  { email: 'admin@chargewell.test', name: 'Nell Abara', roles: ['admin'], authorisationNumber: null },
  {
    email: 'lead@chargewell.test',
    name: 'Jules Tarrant',
    roles: ['technician', 'inspector'],
    authorisationNumber: 'FMR-TI-0033',
  },
  // Three who see part of the organisation, so each role shows the scoping on first sign-in.
  {
    email: 'skelby.technician@chargewell.test',
    name: 'Tamsin Orrell',
    roles: ['technician'],
    authorisationNumber: 'FMR-T-0519',
    stations: ['Skelby'],
  },
  {
    email: 'corran.inspector@chargewell.test',
    name: 'Bram Kettering',
    roles: ['inspector'],
    authorisationNumber: 'FMR-I-0122',
    stations: ['Skelby'],
    operators: ['Corran Isles Airways'],
  },
  {
    email: 'harlow.engineer@chargewell.test',
    name: 'Ada Quillon',
    roles: ['engineer'],
    authorisationNumber: null,
    stations: ['Harlow Moor'],
  },
]

/**
 * The demo organisation: two stations and two operators. Fellmoor Regional maintains its own fleet and
 * QX-FML for Corran Isles Airways, a customer, at Skelby.
 */
const STATIONS = [
  { name: 'Harlow Moor', code: 'HRM', elevation: 420 },
  { name: 'Skelby', code: 'SKB', elevation: 95 },
]
const OWN_OPERATOR = { name: 'Fellmoor Regional', code: 'FMR' }
const CUSTOMER = { name: 'Corran Isles Airways', code: 'CIA' }
const CUSTOMER_AIRCRAFT = ['QX-FML']

const AIRCRAFT = [
  { registration: 'QX-FMA', fleetNumber: '461', type: 'Tarnwing 46', base: 'Harlow Moor' },
  { registration: 'QX-FMB', fleetNumber: '462', type: 'Tarnwing 46', base: 'Harlow Moor' },
  { registration: 'QX-FMC', fleetNumber: '463', type: 'Tarnwing 46', base: 'Skelby' },
  { registration: 'QX-FMJ', fleetNumber: '721', type: 'Tarnwing 72', base: 'Harlow Moor' },
  { registration: 'QX-FMK', fleetNumber: '722', type: 'Tarnwing 72', base: 'Skelby' },
  { registration: 'QX-FML', fleetNumber: '723', type: 'Tarnwing 72', base: 'Skelby' },
]

type SpecificationSeed = Omit<SpecificationDto, 'id' | 'status'>

const common = {
  pressureUnit: 'psi',
  pressureBasis: 'gauge',
  referenceTemperatureUnit: 'C',
  gasModel: 'real',
  checkIntervalDays: 90,
  lossThresholdPerDay: 0.8,
} as const

const SPECIFICATIONS: SpecificationSeed[] = [
  {
    ...common,
    partNumber: 'FA-2210-03',
    revision: 'C',
    title: 'Main hydraulic accumulator, Tarnwing 46',
    accumulatorType: 'piston',
    gasVolume: 120,
    gasVolumeUnit: 'in3',
    referencePressure: 1500,
    referenceTemperature: 21,
    toleranceMinus: 50,
    tolerancePlus: 50,
    toleranceUnit: 'psi',
    correctionMethod: 'gas-law',
    maxPressure: 3000,
    minPressure: 1800,
    settleMinutes: 15,
    dataReference: 'TW46 SMM 29-11-10',
    dataRevision: 'Rev 14',
    tablePoints: [],
  },
  {
    ...common,
    partNumber: 'FA-2240-01',
    revision: 'B',
    title: 'Brake accumulator, Tarnwing 46',
    accumulatorType: 'bladder',
    gasVolume: 60,
    gasVolumeUnit: 'in3',
    referencePressure: 1000,
    referenceTemperature: 21,
    toleranceMinus: 5,
    tolerancePlus: 5,
    toleranceUnit: '%',
    correctionMethod: 'gas-law',
    maxPressure: 3000,
    minPressure: 1500,
    settleMinutes: 10,
    dataReference: 'TW46 SMM 32-42-05',
    dataRevision: 'Rev 9',
    tablePoints: [],
  },
  {
    ...common,
    partNumber: 'FA-2260-02',
    revision: 'A',
    title: 'Emergency brake accumulator, Tarnwing 46',
    accumulatorType: 'piston',
    gasVolume: 200,
    gasVolumeUnit: 'in3',
    referencePressure: 1200,
    referenceTemperature: 21,
    toleranceMinus: 40,
    tolerancePlus: 60,
    toleranceUnit: 'psi',
    correctionMethod: 'gas-law',
    maxPressure: 3000,
    minPressure: 1400,
    settleMinutes: 20,
    dataReference: 'TW46 SMM 32-44-20',
    dataRevision: 'Rev 3',
    tablePoints: [],
  },
  {
    ...common,
    partNumber: 'FJ-3310-05',
    revision: 'D',
    title: 'System accumulator, Tarnwing 72',
    accumulatorType: 'bladder',
    gasVolume: 150,
    gasVolumeUnit: 'in3',
    referencePressure: 1500,
    referenceTemperature: 20,
    toleranceMinus: 50,
    tolerancePlus: 50,
    toleranceUnit: 'psi',
    correctionMethod: 'table',
    maxPressure: 3000,
    minPressure: 1750,
    settleMinutes: 15,
    dataReference: 'TW72 SMM 29-10-00 Fig. 601',
    dataRevision: 'Rev 22',
    // An approved-data chart of pre-charge against gas temperature (invented figures).
    tablePoints: [
      { temperature: -40, temperatureUnit: 'C', pressure: 1170 },
      { temperature: -20, temperatureUnit: 'C', pressure: 1280 },
      { temperature: 0, temperatureUnit: 'C', pressure: 1390 },
      { temperature: 20, temperatureUnit: 'C', pressure: 1500 },
      { temperature: 40, temperatureUnit: 'C', pressure: 1610 },
      { temperature: 60, temperatureUnit: 'C', pressure: 1720 },
    ],
  },
  {
    ...common,
    partNumber: 'FJ-3340-02',
    revision: 'B',
    title: 'Brake accumulator, Tarnwing 72',
    accumulatorType: 'diaphragm',
    gasVolume: 80,
    gasVolumeUnit: 'in3',
    referencePressure: 1000,
    referenceTemperature: 20,
    toleranceMinus: 40,
    tolerancePlus: 40,
    toleranceUnit: 'psi',
    correctionMethod: 'gas-law',
    maxPressure: 3000,
    minPressure: 1400,
    settleMinutes: 10,
    dataReference: 'TW72 SMM 32-41-00',
    dataRevision: 'Rev 11',
    tablePoints: [],
  },
]

const POSITIONS: Record<string, { position: string, system: string, partNumber: string }[]> = {
  'Tarnwing 46': [
    { position: 'Main hydraulic, left wheel well', system: 'Hydraulic system A', partNumber: 'FA-2210-03' },
    { position: 'Normal brake, nose bay', system: 'Brake system', partNumber: 'FA-2240-01' },
    { position: 'Emergency brake, nose bay', system: 'Emergency brake system', partNumber: 'FA-2260-02' },
  ],
  'Tarnwing 72': [
    { position: 'System 1, aft equipment bay', system: 'Hydraulic system 1', partNumber: 'FJ-3310-05' },
    { position: 'System 2, aft equipment bay', system: 'Hydraulic system 2', partNumber: 'FJ-3310-05' },
    { position: 'Normal brake, left wheel well', system: 'Brake system', partNumber: 'FJ-3340-02' },
    {
      position: 'Parking/emergency brake, right wheel well',
      system: 'Emergency brake system',
      partNumber: 'FA-2260-02',
    },
  ],
}

/** The unit that loses gas slowly in the demo history: QX-FMC's normal brake accumulator. */
export const LEAKING_UNIT = { registration: 'QX-FMC', position: 'Normal brake, nose bay', lossPerDay: 0.75 }

const DAY = 86_400_000

function isoDate(date: Date): string {
  return date.toISOString().slice(0, 10)
}

/** A small deterministic generator, so every seeded database holds the same history. */
function randomSource(seed: number) {
  let state = seed >>> 0
  return () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0
    return state / 4294967296
  }
}

/** The stations and operators (the migration made the own operator; it gets the demo's name). */
async function seedOrganisation(): Promise<void> {
  const timeZone = String(useRuntimeConfig().public.stationTimeZone)
  for (const station of STATIONS) {
    await Station.findOrCreate({
      where: { name: station.name },
      defaults: { name: station.name, code: station.code, timeZone, elevationValue: station.elevation, elevationUnit: 'ft' },
    })
  }
  const own = await Operator.findOne({ where: { own: true } })
  if (own && own.name !== OWN_OPERATOR.name) await own.update(OWN_OPERATOR)
  if (!own) await Operator.create({ ...OWN_OPERATOR, own: true })
  await Operator.findOrCreate({ where: { name: CUSTOMER.name }, defaults: CUSTOMER })
}

async function seedUsers(): Promise<Record<string, User>> {
  const users: Record<string, User> = {}
  for (const { stations, operators, ...demo } of DEMO_USERS) {
    const existing = await User.findOne({ where: { email: demo.email } })
    const home = STATIONS.find(station => station.name === (stations?.[0] ?? 'Harlow Moor'))!
    users[demo.email]
      = existing
        ?? (await User.create({
          ...demo,
          passwordHash: await hashPassword(DEMO_PASSWORD),
          preferences: {
            ...DEFAULT_PREFERENCES,
            stationElevation: { value: home.elevation, unit: 'ft' },
            stationName: home.name,
          },
          stationIds: stations
            ? (await Station.findAll({ where: { name: stations } })).map(station => station.id)
            : null,
          operatorIds: operators
            ? (await Operator.findAll({ where: { name: operators } })).map(operator => operator.id)
            : null,
        }))
  }
  await seedAuthorisations(users)
  return users
}

/** The demo's register of certifying authorisations: each signer holds one covering both demo types. */
async function seedAuthorisations(users: Record<string, User>): Promise<void> {
  const terms = {
    scopeKind: 'aircraft-types' as const,
    scope: ['Tarnwing 46', 'Tarnwing 72'],
    issuedOn: '2025-01-15',
    expiresOn: '2028-01-14',
    issuingBody: 'Fellmoor Regional Quality Department',
    suspendedAt: null,
    suspendedReason: null,
  }
  for (const demo of DEMO_USERS) {
    if (!demo.authorisationNumber) continue
    const roles = demo.roles
    const privileges = roles.includes('technician') && roles.includes('inspector') ? 'both' : roles.includes('inspector') ? 'inspect' : 'perform'
    await Authorisation.findOrCreate({
      where: { number: demo.authorisationNumber },
      defaults: { ...terms, number: demo.authorisationNumber, holderId: users[demo.email]!.id, privileges },
    })
  }
}

async function seedScenario(users: Record<string, User>): Promise<void> {
  if ((await Aircraft.count()) > 0) return
  await writeTransaction(async (transaction) => {
    const specifications: Record<string, Specification> = {}
    for (const { tablePoints, ...fields } of SPECIFICATIONS) {
      const specification = await Specification.create(
        { ...fields, status: 'current', supersedesId: null },
        { transaction },
      )
      for (const point of tablePoints)
        await SpecificationTablePoint.create({ ...point, specificationId: specification.id }, { transaction })
      specifications[fields.partNumber] = specification
    }
    // A superseded revision, so the register shows how revisions chain.
    const oldBrake = await Specification.create(
      {
        ...SPECIFICATIONS[1]!,
        revision: 'A',
        dataRevision: 'Rev 7',
        status: 'superseded',
        supersedesId: null,
        createdAt: new Date(Date.now() - 700 * DAY),
      },
      { transaction },
    )
    await specifications['FA-2240-01']!.update({ supersedesId: oldBrake.id }, { transaction })

    const now = new Date()
    const gauges = [
      await Tool.create(
        {
          kind: 'gauge',
          assetNumber: 'GA-0141',
          description: 'Nitrogen charging gauge 0–4000 psi, 6 in dial',
          rangeMax: 4000,
          rangeUnit: 'psi',
          resolution: 20,
          accuracy: 0.25,
          accuracyUnit: '%FS',
          calibrationDue: isoDate(new Date(now.getTime() + 140 * DAY)),
        },
        { transaction },
      ),
      await Tool.create(
        {
          kind: 'gauge',
          assetNumber: 'GA-0152',
          description: 'Digital test gauge 0–5000 psi',
          rangeMax: 5000,
          rangeUnit: 'psi',
          resolution: 1,
          accuracy: 0.1,
          accuracyUnit: '%FS',
          calibrationDue: isoDate(new Date(now.getTime() + 260 * DAY)),
        },
        { transaction },
      ),
      await Tool.create(
        {
          kind: 'gauge',
          assetNumber: 'GA-0098',
          description: 'Nitrogen charging gauge 0–3000 psi (calibration expired)',
          rangeMax: 3000,
          rangeUnit: 'psi',
          resolution: 20,
          accuracy: 0.5,
          accuracyUnit: '%FS',
          calibrationDue: isoDate(new Date(now.getTime() - 21 * DAY)),
        },
        { transaction },
      ),
    ]
    const carts = [
      await Tool.create(
        {
          kind: 'cart',
          assetNumber: 'NC-07',
          description: 'Nitrogen cart, two 50 L cylinders, regulator to 3500 psi',
          rangeMax: 3500,
          rangeUnit: 'psi',
          resolution: null,
          accuracy: null,
          accuracyUnit: null,
          calibrationDue: isoDate(new Date(now.getTime() + 90 * DAY)),
        },
        { transaction },
      ),
      await Tool.create(
        {
          kind: 'cart',
          assetNumber: 'NC-11',
          description: 'Nitrogen cart, booster, regulator to 5000 psi',
          rangeMax: 5000,
          rangeUnit: 'psi',
          resolution: null,
          accuracy: null,
          accuracyUnit: null,
          calibrationDue: isoDate(new Date(now.getTime() + 200 * DAY)),
        },
        { transaction },
      ),
    ]

    // As a worksheet freezes them (GA-0141: 0.25 % of 4000 psi full scale = ±10 psi).
    const gaugeSnapshot: ToolSnapshot = {
      id: gauges[0]!.id,
      assetNumber: gauges[0]!.assetNumber,
      description: gauges[0]!.description,
      calibrationDue: gauges[0]!.calibrationDue,
      accuracy: gaugeAccuracy(gauges[0]!),
    }
    const cartSnapshot: ToolSnapshot = {
      id: carts[0]!.id,
      assetNumber: carts[0]!.assetNumber,
      description: carts[0]!.description,
      calibrationDue: carts[0]!.calibrationDue,
    }
    const random = randomSource(4601)
    let serial = 1000
    const installedAt = isoDate(new Date(now.getTime() - 420 * DAY))
    const own = (await Operator.findOne({ where: { own: true }, transaction }))!
    const customer = (await Operator.findOne({ where: { name: CUSTOMER.name }, transaction }))!
    const performers = [users['technician@chargewell.test']!, users['lead@chargewell.test']!]
    const inspectors = [users['inspector@chargewell.test']!, users['lead@chargewell.test']!]
    for (const aircraftSeed of AIRCRAFT) {
      const operator = CUSTOMER_AIRCRAFT.includes(aircraftSeed.registration) ? customer : own
      const aircraft = await Aircraft.create({ ...aircraftSeed, operatorId: operator.id }, { transaction })
      for (const slot of POSITIONS[aircraftSeed.type]!) {
        const specification = specifications[slot.partNumber]!
        const accumulator = await Accumulator.create(
          {
            partNumber: slot.partNumber,
            serialNumber: `SN${++serial}`,
            aircraftId: aircraft.id,
            position: slot.position,
            system: slot.system,
            installedAt,
          },
          { transaction },
        )
        await install(accumulator.id, aircraft.id, slot.position, installedAt, transaction)
        const leaking
          = aircraftSeed.registration === LEAKING_UNIT.registration && slot.position === LEAKING_UNIT.position
        await seedHistory({
          specification: {
            ...SPECIFICATIONS.find(seed => seed.partNumber === slot.partNumber)!,
            id: specification.id,
            status: 'current',
          },
          aircraft,
          accumulator,
          leaking,
          random,
          gauge: gaugeSnapshot,
          cart: cartSnapshot,
          performer: () => performers[Math.floor(random() * 2)]!,
          inspectorFor: (performer: User) => inspectors.find(user => user.id !== performer.id)!,
          transaction,
        })
      }
    }
    await seedCycleChecks(users['technician@chargewell.test']!, randomSource(7202), transaction)
    await seedOpenWork({ specifications, gauge: gaugeSnapshot, cart: cartSnapshot, users, transaction })
    // Every record the seed wrote directly is vouched for by the trail from here on.
    await baselineRecords(transaction)
    await appendAudit(
      {
        actorId: null,
        entity: 'system',
        entityId: 'seed',
        action: 'seeded',
        detail: { aircraft: AIRCRAFT.length, engineVersion: ENGINE_VERSION },
      },
      transaction,
    )
  })
}

interface HistoryContext {
  specification: SpecificationDto
  aircraft: Aircraft
  accumulator: Accumulator
  leaking: boolean
  random: () => number
  gauge: ToolSnapshot
  cart: ToolSnapshot
  performer: () => User
  inspectorFor: (performer: User) => User
  transaction: Transaction
}

/**
 * A year of released servicing every ~60 days: as-found drifts (fast for the leaking unit), charged back when
 * out of limits.
 */
async function seedHistory(context: HistoryContext): Promise<void> {
  const { specification, random, transaction } = context
  const ambient = { elevation: { value: 420, unit: 'ft' as const } }
  const now = Date.now()
  // Pressure the gas would show at the reference temperature: what actually changes with a leak.
  let heldAtReference = specification.referencePressure + (random() - 0.5) * 20
  let lastService = now - 365 * DAY
  for (let visit = 0; visit < 6; visit++) {
    const serviceTime = lastService + (55 + random() * 10) * DAY
    if (serviceTime > now - 3 * DAY) break
    const days = (serviceTime - lastService) / DAY
    heldAtReference -= (context.leaking ? LEAKING_UNIT.lossPerDay : 0.03) * days + (random() - 0.5) * 4
    const dayOfYear = new Date(serviceTime).getUTCMonth() * 30.4
    const gasCelsius
      = Math.round((9 - 11 * Math.cos(((dayOfYear - 15) / 365) * 2 * Math.PI) + (random() - 0.5) * 6) * 2) / 2
    const gasTemperature: Temperature = { value: gasCelsius, unit: 'C' }
    const reference = specificationChargeTarget(
      { ...specification, correctionMethod: 'gas-law', gasModel: 'real' },
      { value: specification.referenceTemperature, unit: 'C' },
      ambient,
    )
    // The true reading: the held charge carried from the reference temperature to today's gas temperature.
    const scale = heldAtReference / reference.target.value
    const target = specificationChargeTarget(specification, gasTemperature, ambient)
    const asFound: Pressure = specificationPressure(specification, Math.round((target.target.value * scale) / 5) * 5)
    const asFoundResult = assessWorksheetReading(specification, asFound, gasTemperature, ambient, context.gauge)
    const halfBand = target.target.value - target.low!.value
    const action
      = asFoundResult.assessment.verdict === 'low' || asFoundResult.assessment.difference < -0.6 * halfBand
        ? 'charge'
        : asFoundResult.assessment.verdict === 'high'
          ? 'vent'
          : 'none'
    let asLeft = asFound
    if (action !== 'none') {
      asLeft = specificationPressure(specification, Math.round(target.target.value / 5) * 5)
      heldAtReference = specification.referencePressure + (random() - 0.5) * 10
    }
    const asLeftResult = assessWorksheetReading(specification, asLeft, gasTemperature, ambient, context.gauge)
    const performer = context.performer()
    const inspector = context.inspectorFor(performer)
    const performedAt = new Date(serviceTime)
    const at = (minutes: number) => new Date(serviceTime + minutes * 60_000).toISOString()
    const releasedAt = new Date(serviceTime + 150 * 60_000)
    const content: WorksheetContent = {
      ...frozenContent(context.accumulator, context.aircraft, context.specification),
      preparation: { systemDepressurised: at(2), aircraftSafe: at(3), eyeProtection: at(4), nitrogenOnly: at(4) },
      tools: { gauge: context.gauge, cart: context.cart },
      conditions: { gasTemperature, temperatureMethod: 'ambient-shade', minutesSinceOperated: 120, ambient },
      asFound: { reading: asFound, recordedAt: at(10) },
      action: { kind: action, recordedAt: at(12) },
      asLeft: {
        reading: asLeft,
        gasTemperature,
        recordedAt: at(12 + (action === 'none' ? 1 : specification.settleMinutes + 5)),
      },
      finish: {
        valveLeakCheck: true,
        capFitted: true,
        remarks: action === 'charge' ? 'Charged to target.' : '',
        unserviceableReference: null,
        recordedAt: at(50),
      },
    }
    const results: WorksheetResults = { asFound: asFoundResult, asLeft: asLeftResult }
    const worksheet = await Worksheet.create(
      {
        state: 'released',
        accumulatorId: context.accumulator.id,
        aircraftId: context.aircraft.id,
        specificationId: specification.id,
        performerId: performer.id,
        correctsId: null,
        workOrder: `WO-${new Date(serviceTime).getUTCFullYear()}-${String(Math.floor(random() * 90000) + 10000)}`,
        reason: 'scheduled',
        serviceable: asLeftResult.assessment.verdict === 'in-limits',
        returnReason: null,
        voidReason: null,
        voidedById: null,
        content,
        results,
        engineVersion: ENGINE_VERSION,
        performedAt,
        submittedAt: new Date(serviceTime + 60 * 60_000),
        releasedAt,
        createdAt: performedAt,
        updatedAt: releasedAt,
      },
      { transaction },
    )
    await createSignature(worksheet, performer, 'performer', worksheet.submittedAt!, transaction)
    await createSignature(worksheet, inspector, 'inspector', releasedAt, transaction)
    await appendAudit(
      {
        at: releasedAt,
        actorId: inspector.id,
        entity: 'worksheet',
        entityId: String(worksheet.id),
        action: 'released',
        detail: { performer: performer.id, inspector: inspector.id },
      },
      transaction,
    )
    lastService = serviceTime
  }
}

interface OpenWorkContext {
  specifications: Record<string, Specification>
  gauge: ToolSnapshot
  cart: ToolSnapshot
  users: Record<string, User>
  transaction: Transaction
}

/**
 * Today's unfinished work, so every role has something on first sign-in: four worksheets
 * awaiting countersign (three by the technician, one by the lead), one returned to the
 * technician with a reason, and one draft the technician has started.
 */
async function seedOpenWork({ specifications, gauge, cart, users, transaction }: OpenWorkContext): Promise<void> {
  const technician = users['technician@chargewell.test']!
  const lead = users['lead@chargewell.test']!
  const inspector = users['inspector@chargewell.test']!
  const ambient = { elevation: { value: 420, unit: 'ft' as const } }
  const plan: {
    registration: string
    position: string
    performer: User
    state: 'awaiting-countersign' | 'returned' | 'draft'
    hoursAgo: number
    gasCelsius: number
  }[] = [
    {
      registration: 'QX-FMA',
      position: 'Main hydraulic, left wheel well',
      performer: technician,
      state: 'awaiting-countersign',
      hoursAgo: 5,
      gasCelsius: 6,
    },
    {
      registration: 'QX-FMB',
      position: 'Emergency brake, nose bay',
      performer: technician,
      state: 'awaiting-countersign',
      hoursAgo: 4,
      gasCelsius: 7,
    },
    {
      registration: 'QX-FMK',
      position: 'System 2, aft equipment bay',
      performer: technician,
      state: 'awaiting-countersign',
      hoursAgo: 3,
      gasCelsius: 8.5,
    },
    {
      registration: 'QX-FML',
      position: 'Normal brake, left wheel well',
      performer: lead,
      state: 'awaiting-countersign',
      hoursAgo: 2,
      gasCelsius: 9,
    },
    {
      registration: 'QX-FMJ',
      position: 'Normal brake, left wheel well',
      performer: technician,
      state: 'returned',
      hoursAgo: 26,
      gasCelsius: 4,
    },
    {
      registration: 'QX-FMB',
      position: 'Main hydraulic, left wheel well',
      performer: technician,
      state: 'draft',
      hoursAgo: 1,
      gasCelsius: 10,
    },
  ]
  let workOrder = 88000
  for (const item of plan) {
    const aircraft = (await Aircraft.findOne({ where: { registration: item.registration }, transaction }))!
    const accumulator = (await Accumulator.findOne({
      where: { aircraftId: aircraft.id, position: item.position },
      transaction,
    }))!
    const seedSpecification = SPECIFICATIONS.find(candidate => candidate.partNumber === accumulator.partNumber)!
    const specification: SpecificationDto = {
      ...seedSpecification,
      id: specifications[accumulator.partNumber]!.id,
      status: 'current',
    }
    const start = Date.now() - item.hoursAgo * 3_600_000
    const at = (minutes: number) => new Date(start + minutes * 60_000).toISOString()
    const gasTemperature: Temperature = { value: item.gasCelsius, unit: 'C' }
    const target = specificationChargeTarget(specification, gasTemperature, ambient)
    const reading = specificationPressure(specification, Math.round(target.target.value / 5) * 5)
    const result = assessWorksheetReading(specification, reading, gasTemperature, ambient, gauge)
    const content: WorksheetContent = {
      ...frozenContent(accumulator, aircraft, specification),
      preparation: { systemDepressurised: at(2), aircraftSafe: at(3), eyeProtection: at(4), nitrogenOnly: at(4) },
      tools: { gauge, cart },
      conditions: { gasTemperature, temperatureMethod: 'ambient-shade', minutesSinceOperated: 95, ambient },
    }
    const finished = item.state !== 'draft'
    if (finished) {
      content.asFound = { reading, recordedAt: at(10) }
      content.action = { kind: 'none', recordedAt: at(11) }
      content.asLeft = { reading, gasTemperature, recordedAt: at(12) }
      content.finish = {
        valveLeakCheck: true,
        capFitted: true,
        remarks: 'In limits; no action.',
        unserviceableReference: null,
        recordedAt: at(20),
      }
    }
    const submittedAt = new Date(start + 25 * 60_000)
    const worksheet = await Worksheet.create(
      {
        state: item.state,
        accumulatorId: accumulator.id,
        aircraftId: aircraft.id,
        specificationId: specification.id,
        performerId: item.performer.id,
        correctsId: null,
        workOrder: `WO-${new Date().getUTCFullYear()}-${++workOrder}`,
        reason: 'scheduled',
        serviceable: finished ? result.assessment.verdict === 'in-limits' : null,
        returnReason:
          item.state === 'returned'
            ? 'The gas temperature was taken in the sun on the wheel; take it in the shade and re-read the as-found.'
            : null,
        voidReason: null,
        voidedById: null,
        content,
        results: finished ? { asFound: result, asLeft: result } : {},
        engineVersion: ENGINE_VERSION,
        performedAt: new Date(start),
        submittedAt: item.state === 'awaiting-countersign' ? submittedAt : null,
        releasedAt: null,
        round: item.state === 'returned' ? 2 : 1,
        createdAt: new Date(start),
        updatedAt: submittedAt,
      },
      { transaction },
    )
    if (finished) {
      await createSignature({ id: worksheet.id, round: 1 }, item.performer, 'performer', submittedAt, transaction)
    }
    const action = item.state === 'returned' ? 'returned' : item.state === 'draft' ? 'started' : 'signed'
    await appendAudit(
      {
        at: new Date(start + 30 * 60_000),
        actorId: item.state === 'returned' ? inspector.id : item.performer.id,
        entity: 'worksheet',
        entityId: String(worksheet.id),
        action,
        detail: { seeded: true },
      },
      transaction,
    )
  }
}

/** The system that develops an internal leak in the demo: its pump cycles come ever closer. */
export const LEAKING_SYSTEM = { registration: 'QX-FMJ', system: 'Hydraulic system 1' }

/** A year of monthly pump cycle checks on every hydraulic system; one shortens over the last months. */
async function seedCycleChecks(
  technician: User,
  random: () => number,
  transaction: Transaction,
): Promise<void> {
  const systemUnits = (
    await Accumulator.findAll({ include: [{ model: Aircraft, as: 'aircraft' }], transaction })
  ).filter(unit => unit.system?.startsWith('Hydraulic system'))
  for (const unit of systemUnits) {
    const specification = SPECIFICATIONS.find(seed => seed.partNumber === unit.partNumber)!
    const leaking = unit.aircraft?.registration === LEAKING_SYSTEM.registration && unit.system === LEAKING_SYSTEM.system
    for (let month = 0; month < 12; month++) {
      const checkedAt = new Date(Date.now() - (350 - month * 30) * DAY)
      const shortening = leaking && month >= 7 ? 1 - 0.12 * (month - 6) : 1
      const seconds = Math.round((420 + (random() - 0.5) * 30) * shortening)
      const body = {
        aircraftId: unit.aircraft!.id,
        system: unit.system!,
        checkedAt: checkedAt.toISOString().slice(0, 10),
        cutOut: { value: 3000, unit: 'psi' as const, basis: 'gauge' as const },
        cutIn: { value: 2600, unit: 'psi' as const, basis: 'gauge' as const },
        interval: { value: seconds, unit: 's' as const },
        fluidTemperature: { value: Math.round(38 + random() * 8), unit: 'C' as const },
        ambient: { elevation: { value: 420, unit: 'ft' as const } },
      }
      const result = cycleCheckLeakRate(body, specification)
      await CycleCheck.create(
        {
          aircraftId: unit.aircraft!.id,
          accumulatorId: unit.id,
          system: unit.system!,
          checkedAt,
          inputs: body,
          results: {
            fluidReleased: result.fluidReleased,
            leakRate: result.leakRate,
            warnings: result.warnings,
            method: result.method,
          },
          intervalSeconds: seconds,
          engineVersion: result.engineVersion,
          recordedById: technician.id,
          createdAt: checkedAt,
        },
        { transaction },
      )
    }
  }
}

/** Migrates (on opening) and fills the server's database with the demo scenario; a second run changes nothing. */
export async function seedDemo(): Promise<{ users: number, aircraft: number, worksheets: number }> {
  await useDB()
  await seedOrganisation()
  const users = await seedUsers()
  await seedScenario(users)
  await rebuildTrends(writeTransaction)
  return { users: await User.count(), aircraft: await Aircraft.count(), worksheets: await Worksheet.count() }
}
