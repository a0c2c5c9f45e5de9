import type { EntityManager } from 'typeorm';
import type { Role } from '@common/api/roles';
import { Organisation } from '../entities/organisation.entity';
import { Site } from '../entities/site.entity';
import { User, UserRole, UserSite } from '../entities/user.entity';
import { CylinderType, Supplier, SupplierPrice } from '../entities/catalogue.entity';
import { hashPassword } from '../../modules/auth/auth.service';
import { standardAtmosphereBar } from '../../modules/sites/sites.service';

/** The demo organisation's name: invented, like everything in the demo data. */
export const DEMO_ORGANISATION = 'Alderhythe & Quillmere Health (demo)';
export const DEMO_PASSWORD = 'demo-plenum';

export const DEMO_USERS: { email: string; name: string; roles: Role[]; sites: 'all' | 'hospital' }[] = [
  { email: 'facilities@plenum.example', name: 'Morwenna Tallis', roles: ['facilities_manager'], sites: 'all' },
  { email: 'ward@plenum.example', name: 'Idris Penhallow', roles: ['ward_lead'], sites: 'hospital' },
  { email: 'purchasing@plenum.example', name: 'Saoirse Vantongeren', roles: ['purchasing_officer'], sites: 'all' },
  { email: 'biomed@plenum.example', name: 'Teodor Achterberg', roles: ['biomedical_engineer'], sites: 'all' },
  { email: 'admin@plenum.example', name: 'Ffion Castellane', roles: ['administrator'], sites: 'all' },
];

export interface FoundationIds {
  organisationId: number;
  hospitalId: number;
  clinicId: number;
  cylinderTypes: Record<string, number>;
  supplierIds: { cylinders: number; bulk: number };
  userIds: Record<string, number>;
}

/** Cylinder types of the demo catalogue, by water capacity and fill pressure (key → row). */
export const CYLINDER_TYPES: Record<string, Partial<CylinderType>> = {
  'O2-1.2-230': {
    gasCode: 'O2',
    waterCapacityL: 1.2,
    fillPressureBar: 230,
    material: 'aluminium',
    valveNotes: 'integral valve with flow selector and contents gauge',
  },
  'O2-2-230': {
    gasCode: 'O2',
    waterCapacityL: 2,
    fillPressureBar: 230,
    material: 'aluminium',
    valveNotes: 'integral valve with flow selector and contents gauge',
  },
  'O2-10-200': { gasCode: 'O2', waterCapacityL: 10, fillPressureBar: 200, material: 'steel', valveNotes: 'integral valve; manifold and ward use' },
  'O2-47-137': { gasCode: 'O2', waterCapacityL: 47, fillPressureBar: 137, material: 'steel', valveNotes: 'pin-index; manifold use' },
  'O2-50-200': { gasCode: 'O2', waterCapacityL: 50, fillPressureBar: 200, material: 'steel', valveNotes: 'manifold use' },
  'AIR-10-200': { gasCode: 'AIR', waterCapacityL: 10, fillPressureBar: 200, material: 'steel', valveNotes: 'integral valve' },
  'AIR-50-200': { gasCode: 'AIR', waterCapacityL: 50, fillPressureBar: 200, material: 'steel', valveNotes: 'manifold use' },
  'N2O-10-44': {
    gasCode: 'N2O',
    waterCapacityL: 10,
    fillPressureBar: 44,
    tareKg: 14.5,
    maxFillingRatioKgPerL: 0.75,
    material: 'steel',
    valveNotes: 'liquefied: count by weight',
  },
  'N2O-47-44': {
    gasCode: 'N2O',
    waterCapacityL: 47,
    fillPressureBar: 44,
    tareKg: 58,
    maxFillingRatioKgPerL: 0.75,
    material: 'steel',
    valveNotes: 'liquefied: count by weight; manifold use',
  },
  'N2O_O2_50-10-137': { gasCode: 'N2O_O2_50', waterCapacityL: 10, fillPressureBar: 137, material: 'steel', valveNotes: 'store above 10 °C' },
  'CO2-10-50': {
    gasCode: 'CO2',
    waterCapacityL: 10,
    fillPressureBar: 50,
    tareKg: 14,
    maxFillingRatioKgPerL: 0.75,
    material: 'steel',
    valveNotes: 'liquefied: count by weight; laparoscopy',
  },
  'HE_O2_79-10-200': { gasCode: 'HE_O2_79', waterCapacityL: 10, fillPressureBar: 200, material: 'steel', valveNotes: '' },
  'N2-10-200': { gasCode: 'N2', waterCapacityL: 10, fillPressureBar: 200, material: 'steel', valveNotes: 'surgical tool drive' },
};

/** Creates the demo organisation, its two sites, the catalogue, two suppliers and one user per role. */
export async function seedFoundation(m: EntityManager): Promise<FoundationIds> {
  const org = await m.getRepository(Organisation).save({ name: DEMO_ORGANISATION });
  const siteRepo = m.getRepository(Site);
  const hospital = await siteRepo.save(
    siteRepo.create({
      organisationId: org.id,
      name: 'Alderhythe General Hospital',
      kind: 'hospital',
      address: '1 Infirmary Lane, Alderhythe (fictional)',
      timeZone: 'Europe/London',
      referenceCode: '15C',
      unitSystem: 'metric',
      altitudeM: 45,
      atmosphericBar: Number(standardAtmosphereBar(45).toFixed(5)),
      currency: 'GBP',
      cylinderColours: 'ISO32',
      storeTemperatureC: 8,
      beds: 350,
    }),
  );
  const clinic = await siteRepo.save(
    siteRepo.create({
      organisationId: org.id,
      name: 'Quillmere Day Clinic',
      kind: 'clinic',
      address: '14 Weir Street, Quillmere (fictional)',
      timeZone: 'Europe/London',
      referenceCode: '15C',
      unitSystem: 'metric',
      altitudeM: 120,
      atmosphericBar: Number(standardAtmosphereBar(120).toFixed(5)),
      currency: 'GBP',
      cylinderColours: 'ISO32',
      storeTemperatureC: 14,
      beds: 20,
    }),
  );

  const hash = await hashPassword(DEMO_PASSWORD);
  const userIds: Record<string, number> = {};
  for (const u of DEMO_USERS) {
    const saved = await m.getRepository(User).save(
      m.getRepository(User).create({
        organisationId: org.id,
        email: u.email,
        name: u.name,
        passwordHash: hash,
        active: true,
        failedLogins: 0,
        lockedUntil: null,
        passwordChangedAt: new Date(),
      }),
    );
    userIds[u.email] = saved.id;
    await m.getRepository(UserRole).insert(u.roles.map((role) => ({ userId: saved.id, role })));
    const siteIds = u.sites === 'all' ? [hospital.id, clinic.id] : [hospital.id];
    await m.getRepository(UserSite).insert(siteIds.map((siteId) => ({ userId: saved.id, siteId })));
  }

  const cylinderTypes: Record<string, number> = {};
  for (const [key, row] of Object.entries(CYLINDER_TYPES)) {
    const saved = await m
      .getRepository(CylinderType)
      .save(m.getRepository(CylinderType).create({ tareKg: null, maxFillingRatioKgPerL: null, active: true, ...row, organisationId: org.id }));
    cylinderTypes[key] = saved.id;
  }

  const supRepo = m.getRepository(Supplier);
  const cylSupplier = await supRepo.save(
    supRepo.create({
      organisationId: org.id,
      name: 'Tamsin Vale Gas Services (demo)',
      orderEmail: 'orders@tamsinvale.example',
      phone: '+44 1632 960 118',
      leadTimeHours: 24,
      rentalMinorPerCylinderDay: 9,
      minBulkDropKg: 0,
      currency: 'GBP',
      active: true,
    }),
  );
  const bulkSupplier = await supRepo.save(
    supRepo.create({
      organisationId: org.id,
      name: 'Corbel Cryogenic Supply (demo)',
      orderEmail: 'bulk-orders@corbelcryo.example',
      phone: '+44 1632 960 442',
      leadTimeHours: 48,
      rentalMinorPerCylinderDay: 0,
      minBulkDropKg: 2000,
      currency: 'GBP',
      active: true,
    }),
  );
  // Demo prices in pence (invented).
  const cylPrices: [string, number][] = [
    ['O2-1.2-230', 1450],
    ['O2-2-230', 1750],
    ['O2-10-200', 2600],
    ['O2-47-137', 4200],
    ['O2-50-200', 5200],
    ['AIR-10-200', 2300],
    ['AIR-50-200', 4600],
    ['N2O-10-44', 3900],
    ['N2O-47-44', 11800],
    ['N2O_O2_50-10-137', 3400],
    ['CO2-10-50', 2900],
    ['HE_O2_79-10-200', 8800],
    ['N2-10-200', 2500],
  ];
  await m
    .getRepository(SupplierPrice)
    .insert(
      cylPrices.map(([key, priceMinor]) => ({ supplierId: cylSupplier.id, cylinderTypeId: cylinderTypes[key], gasCode: null, unit: 'cylinder', priceMinor })),
    );
  await m.getRepository(SupplierPrice).insert([{ supplierId: bulkSupplier.id, cylinderTypeId: null, gasCode: 'O2', unit: 'kg', priceMinor: 21 }]);

  return {
    organisationId: org.id,
    hospitalId: hospital.id,
    clinicId: clinic.id,
    cylinderTypes,
    supplierIds: { cylinders: cylSupplier.id, bulk: bulkSupplier.id },
    userIds,
  };
}
