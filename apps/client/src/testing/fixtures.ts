import { projectPageSchema, type ProjectPage } from '@trabeate/contracts';

// Invented demo values for specs; parsed by the contract so they stay in the API's shape.

/** A project page as the API answers it to the principal, with the given fields replaced. */
export function aProjectPage(extra: Partial<ProjectPage> = {}): ProjectPage {
  return projectPageSchema.parse({
    id: '00000000-0000-4000-8000-000000000301',
    reference: 'QTH-1',
    name: 'Block one',
    clientOrganisation: { id: '00000000-0000-4000-8000-000000000101', name: 'Quillon Terrace Homes' },
    siteAddress: '4 Ferrow Lane',
    buildingUse: 'Apartments',
    storeys: 5,
    storeyHeightM: 3,
    floorAreaM2: null,
    designBasis: null,
    currency: 'EUR',
    archivedAt: null,
    finance: null,
    members: [],
    stages: [],
    abilities: { work: true, manage: true, seeFinance: true, seeInternal: true, pay: false, acknowledge: false },
    ...extra,
  });
}
