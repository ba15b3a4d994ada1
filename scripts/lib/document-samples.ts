import type { CreditMemoData } from '../../server/lib/pdf/credit-memo';
import type { DeterminationLetterData } from '../../server/lib/pdf/determination-letter';
import type { PackingSlipData } from '../../server/lib/pdf/packing-slip';

// Fictional sample documents for a person to look at (scripts/render-samples.ts) and for the tests. Every
// company, number and amount here is invented for the demo.

const aldercrest = { name: 'Aldercrest Lighting', address: ['400 Foundry Lane', 'Dayton, OH 45402', 'US'] };
const harborview = { name: 'Harborview Electric', address: ['18 Pier Street', 'Portland, ME 04101', 'US'] };

const findings: DeterminationLetterData['evaluation']['findings'] = [
  {
    code: 'coverage.prorated',
    severity: 'info',
    message: 'The unit failed in month 40 of a 60-month term; the credit is prorated to 66.67 %.',
  },
  {
    code: 'application.service_voltage_range_a',
    severity: 'pass',
    message: 'Measured supply of 276 V is within Range A for a 277 V service.',
    reference: 'ANSI C84.1, Table 1',
  },
  {
    code: 'electrical.string_open',
    severity: 'fail',
    message: 'String 3 carries no current: an open LED or connection.',
    reference: 'LED application-note practice',
  },
  {
    code: 'application.matches_rating',
    severity: 'pass',
    message: 'The damp location matches the fixture’s damp rating.',
    reference: 'NFPA 70 (NEC) Article 100 and 410.10(A)',
  },
];

const letterBase: Omit<DeterminationLetterData, 'decision'> = {
  claimNumber: 'LP-2025-00417',
  letterDate: '2025-06-12',
  filedOn: '2025-05-28',
  failedOn: '2025-05-20',
  contractor: harborview,
  manufacturer: aldercrest,
  product: { model: 'AC-HB150-50K', name: 'Aldercrest Highbay 150 W, 5000 K' },
  site: { name: 'Casco Bay cold store, bay 4', address: ['220 Commercial St, Portland, ME'] },
  installedOn: '2022-01-14',
  units: { count: 2, serials: ['HB150-21K0937', 'HB150-21K0941'] },
  evaluation: { engineVersion: '1.0.0', verdict: 'covered', findings },
};

export const sampleApprovalLetter: DeterminationLetterData = {
  ...letterBase,
  decision: {
    outcome: 'approved',
    resolution: 'credit',
    amount: '256.01',
    currency: 'USD',
    note: 'Both units qualify; the credit follows the policy’s proration.',
    reviewer: 'Rhea Okafor',
    decidedOn: '2025-06-12',
  },
};

export const sampleRepairLetter: DeterminationLetterData = {
  ...letterBase,
  claimNumber: 'LP-2025-00422',
  decision: {
    outcome: 'partly_approved',
    resolution: 'repair_allowance',
    amount: '120.00',
    currency: 'USD',
    approvedUnits: 1,
    note: 'One unit qualifies; an allowance covers a driver replacement by your electrician.',
    overrideReason: 'Only one of the two units shows the open string; the second was working on the bench.',
    reviewer: 'Rhea Okafor',
    decidedOn: '2025-06-12',
  },
};

export const sampleDenialLetter: DeterminationLetterData = {
  ...letterBase,
  claimNumber: 'LP-2025-00431',
  evaluation: {
    engineVersion: '1.0.0',
    verdict: 'excluded',
    findings: [
      {
        code: 'application.location_wetter_than_rated',
        severity: 'fail',
        message: 'Installed in a wet location; the fixture is rated for damp locations only.',
        reference: 'NFPA 70 (NEC) Article 100 and 410.10(A)',
      },
      {
        code: 'evidence.water_ingress',
        severity: 'fail',
        message: 'Water was seen inside the housing.',
      },
    ],
  },
  decision: {
    outcome: 'denied',
    reasonCodes: ['wrong_location', 'ingress'],
    note: 'The fixtures were mounted under an open canopy exposed to rain; they are marked for damp locations.',
    reviewer: 'Rhea Okafor',
    decidedOn: '2025-06-12',
  },
};

export const samplePackingSlip: PackingSlipData = {
  raNumber: 'RA-2025-00088',
  claimNumber: 'LP-2025-00417',
  issuedOn: '2025-06-03',
  manufacturer: aldercrest,
  contractor: harborview,
  shipTo: {
    name: 'Aldercrest Lighting, returns lab',
    attention: 'Warranty bench',
    line1: '400 Foundry Lane, dock 2',
    city: 'Dayton',
    region: 'OH',
    postalCode: '45402',
    country: 'US',
  },
  product: { model: 'AC-HB150-50K', name: 'Aldercrest Highbay 150 W, 5000 K' },
  units: [{ serial: 'HB150-21K0937' }, { serial: 'HB150-21K0941' }],
  instructions: 'Please include the driver’s wiring harness; we will test it with the unit.',
};

export const sampleCreditMemo: CreditMemoData = {
  memoNumber: 'CM-2025-00031',
  memoDate: '2025-06-16',
  manufacturer: aldercrest,
  contractor: { ...harborview, accountNumber: 'Account HBE-1042' },
  claimNumber: 'LP-2025-00417',
  currency: 'USD',
  lines: [
    {
      description: 'Warranty credit, AC-HB150-50K (prorated)',
      units: 2,
      unitCredit: '192.00',
      coveragePercent: 66.67,
    },
  ],
};

export const sampleCreditReversal: CreditMemoData = {
  ...sampleCreditMemo,
  memoNumber: 'CM-2025-00034',
  memoDate: '2025-06-20',
  reversal: {
    originalMemoNumber: 'CM-2025-00031',
    originalDate: '2025-06-16',
    reason: 'Issued to the wrong account; a corrected memo follows.',
  },
};
