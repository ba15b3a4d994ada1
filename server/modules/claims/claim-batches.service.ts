import type { AppAbility } from '../../../shared/abilities';
import { In } from 'typeorm';
import { engineInputFor } from '../../../shared/claims/engine-input';
import { parseMeterNumber } from '../../../shared/claims/meter-number';
import { safeEvaluateClaim } from '../../../shared/engine';
import {
  CLAIM_BATCH_MAX_ROWS,
  claimFieldsSchema,
  claimListQuerySchema,
  filingIssues,
  type ClaimBatchFileResult,
  type ClaimBatchResult,
  type ClaimBatchRowError,
} from '../../../shared/schemas/claims';
import type { ImportRequest } from '../../../shared/schemas/catalogue';
import type { SessionUser } from '../../auth/passport';
import type { AppDataSource } from '../../db/data-source';
import { ClaimBatch } from '../../db/entities/claim-batch.entity';
import { Claim } from '../../db/entities/claim.entity';
import { InstallationUnit } from '../../db/entities/installation-unit.entity';
import { Installation } from '../../db/entities/installation.entity';
import { recordAudit, type Actor } from '../../lib/audit';
import { clock } from '../../lib/clock';
import { coerceRow, csvColumns, MAX_LISTED_ERRORS, parseCsvRows, tooManyRows } from '../../lib/csv-import';
import { AppError, notFound } from '../../lib/errors';
import type { ClaimsService } from './claims.service';
import { scopeOf } from './claims-reads.service';
import { engineContextOf } from './engine-input';

// Bulk filing: a spreadsheet of failed units (one row per claim) for one or more installations becomes a batch
// of drafts; the preview (dryRun) marks each bad row by row, column and reason; the drafts are then filed
// together. Each row names its installation by a serial on it, or by the installation's id.

export const CLAIM_BATCH_COLUMNS = csvColumns([
  ['serial', 'list', 'optional', 'ACH2403-H00001'],
  ['model_number', 'string', 'optional', 'AC-HB150-D'],
  ['installation_id', 'string', 'optional', ''],
  ['units', 'number', 'optional', '1'],
  ['failed_on', 'string', 'required', '2025-06-10'],
  ['symptoms', 'list', 'required', 'partly_dark; flicker'],
  ['supply_volts', 'string', 'optional', '276,4'],
  ['input_watts', 'string', 'optional', '148'],
  ['power_factor', 'string', 'optional', '0.95'],
  ['driver_output_volts', 'string', 'optional', '49.2'],
  ['driver_output_amps', 'string', 'optional', '2650 mA'],
  ['debris_ingress', 'boolean', 'optional', 'no'],
  ['water_ingress', 'boolean', 'optional', 'no'],
  ['physical_damage', 'boolean', 'optional', 'no'],
  ['fan_stopped', 'boolean', 'optional', 'no'],
  ['burn_marks', 'boolean', 'optional', 'no'],
  ['narrative', 'string', 'required', 'Two strings dark after a week of flicker.'],
]);

const PATH_COLUMNS: Record<string, string> = {
  serials: 'serial',
  units: 'units',
  failedOn: 'failed_on',
  symptoms: 'symptoms',
  narrative: 'narrative',
  installation: 'serial',
  'measurements.supplyVolts': 'supply_volts',
  'measurements.inputWatts': 'input_watts',
  'measurements.powerFactor': 'power_factor',
  'measurements.driverOutputVolts': 'driver_output_volts',
  'measurements.driverOutputAmps': 'driver_output_amps',
  'observations.debrisIngress': 'debris_ingress',
  'observations.waterIngress': 'water_ingress',
  'observations.physicalDamage': 'physical_damage',
  'observations.fanStopped': 'fan_stopped',
  'observations.burnMarks': 'burn_marks',
};
const columnOf = (path: string) =>
  PATH_COLUMNS[path] ??
  PATH_COLUMNS[path.split('.').slice(0, 2).join('.')] ??
  PATH_COLUMNS[path.split('.')[0]] ??
  '(row)';
const READINGS = [
  ['supplyVolts', 'supply_volts', 'V'],
  ['inputWatts', 'input_watts', 'W'],
  ['powerFactor', 'power_factor', ''],
  ['driverOutputVolts', 'driver_output_volts', 'V'],
  ['driverOutputAmps', 'driver_output_amps', 'A'],
] as const;
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

type LoadedInst = Installation & { units: InstallationUnit[] };

export function createClaimBatchesService(ds: AppDataSource, claims: ClaimsService) {
  return {
    async importRows(
      user: SessionUser,
      input: ImportRequest,
      dryRun: boolean,
      actor: Actor,
      filename: string | null,
    ): Promise<ClaimBatchResult> {
      const contractorId = user.organization.id;
      const { rows, fileErrors } = parseCsvRows(input, CLAIM_BATCH_COLUMNS);
      tooManyRows(rows.length, CLAIM_BATCH_MAX_ROWS);
      const errors: ClaimBatchRowError[] = [...fileErrors];
      const coerced = rows.map((raw) => ({ raw, ...coerceRow(raw, CLAIM_BATCH_COLUMNS) }));

      // Installations named by serial (one query) or by id (one query), the contractor's own only.
      const allSerials = [
        ...new Set(coerced.flatMap((c) => (c.values.serial as string[] | undefined) ?? [])),
      ];
      const unitHits: { serial: string; installationId: string }[] = [];
      for (let i = 0; i < allSerials.length; i += 1000) {
        unitHits.push(
          ...(await ds
            .getRepository(InstallationUnit)
            .createQueryBuilder('u')
            .innerJoin(Installation, 'i', 'i.id = u.installation_id')
            .select(['u.serial AS serial', 'u.installation_id AS installationId'])
            .where('i.contractor_id = :c AND u.serial IN (:...s)', {
              c: contractorId,
              s: allSerials.slice(i, i + 1000),
            })
            .getRawMany<{ serial: string; installationId: string }>()),
        );
      }
      const byIdWanted = coerced
        .map((c) => c.values.installationId)
        .filter((x): x is string => typeof x === 'string' && UUID.test(x));
      const instIds = [...new Set([...unitHits.map((u) => u.installationId), ...byIdWanted])];
      const insts = instIds.length
        ? ((await ds.getRepository(Installation).find({
            where: { id: In(instIds), contractorId },
            relations: { productModel: true, policyVersion: true, units: true },
          })) as LoadedInst[])
        : [];
      const instById = new Map(insts.map((i) => [i.id, i]));
      const hitsBySerial = new Map<string, string[]>();
      for (const h of unitHits)
        hitsBySerial.set(h.serial.toUpperCase(), [
          ...(hitsBySerial.get(h.serial.toUpperCase()) ?? []),
          h.installationId,
        ]);

      type Good = {
        row: number;
        inst: LoadedInst;
        fields: ReturnType<typeof claimFieldsSchema.parse>;
        verdict: ClaimBatchResult['rows'][number]['verdict'];
      };
      const good: Good[] = [];
      const seenSerial = new Map<string, number>();
      for (const c of coerced) {
        const row = c.raw.row;
        const rowErrors: ClaimBatchRowError[] = [...c.errors];
        const v = c.values;
        const serials = (v.serial as string[] | undefined) ?? [];
        let inst: LoadedInst | undefined;
        if (typeof v.installationId === 'string') {
          inst = UUID.test(v.installationId) ? instById.get(v.installationId) : undefined;
          if (!inst)
            rowErrors.push({
              row,
              column: 'installation_id',
              message: `No installation of yours has the id ${v.installationId}.`,
            });
        } else if (serials.length) {
          const model = typeof v.modelNumber === 'string' ? v.modelNumber.toUpperCase() : null;
          const candidates = [...new Set(hitsBySerial.get(serials[0].toUpperCase()) ?? [])]
            .map((id) => instById.get(id)!)
            .filter((i) => i && (!model || i.productModel.modelNumber.toUpperCase() === model));
          if (!candidates.length)
            rowErrors.push({
              row,
              column: 'serial',
              message: `No installation of yours has the serial ${serials[0]}${model ? ` on model ${v.modelNumber}` : ''}.`,
            });
          else if (candidates.length > 1)
            rowErrors.push({
              row,
              column: 'model_number',
              message: `The serial ${serials[0]} is on several of your installations: fill in the model number.`,
            });
          else inst = candidates[0];
        } else {
          rowErrors.push({
            row,
            column: 'serial',
            message: 'Give the serial of the failed unit (or the installation id).',
          });
        }
        const measurements: Record<string, number> = {};
        for (const [field, column, unit] of READINGS) {
          const text = v[field];
          if (typeof text !== 'string') continue;
          const r = parseMeterNumber(text, unit);
          if (r.ok) measurements[field] = r.value;
          else rowErrors.push({ row, column, message: r.message });
        }
        const dupes = serials.filter((s) => seenSerial.has(s.toUpperCase()));
        if (dupes.length)
          rowErrors.push({
            row,
            column: 'serial',
            message: `Also on row ${seenSerial.get(dupes[0].toUpperCase())}: ${dupes.join(', ')}.`,
          });
        for (const s of serials) if (!seenSerial.has(s.toUpperCase())) seenSerial.set(s.toUpperCase(), row);
        const parsed = claimFieldsSchema.safeParse({
          serials,
          ...(v.units !== undefined ? { units: v.units } : {}),
          failedOn: v.failedOn,
          symptoms: v.symptoms,
          measurements,
          observations: Object.fromEntries(
            ['debrisIngress', 'waterIngress', 'physicalDamage', 'fanStopped', 'burnMarks']
              .filter((k) => v[k] !== undefined)
              .map((k) => [k, v[k]]),
          ),
          narrative: typeof v.narrative === 'string' ? v.narrative : '',
        });
        const skip = new Set(rowErrors.map((e) => e.column));
        if (!parsed.success) {
          for (const i of parsed.error.issues) {
            const column = columnOf(i.path.map(String).join('.'));
            if (!skip.has(column)) rowErrors.push({ row, column, message: i.message });
          }
        }
        if (parsed.success && inst) {
          const fields = { ...parsed.data, units: parsed.data.units ?? Math.max(1, serials.length) };
          for (const i of filingIssues(fields, {
            installDate: inst.installDate,
            quantity: inst.quantity,
            serials: inst.units.map((u) => u.serial),
            today: clock.today(),
            hasPolicy: inst.policyVersion !== null,
            ledStrings: inst.productModel.ledStrings,
            ledsPerString: inst.productModel.ledsPerString,
          })) {
            const column = columnOf(i.path);
            if (!skip.has(column)) rowErrors.push({ row, column, message: i.message });
          }
          if (!rowErrors.length) {
            const r = safeEvaluateClaim(
              engineInputFor(
                engineContextOf(inst.productModel, inst.policyVersion, inst),
                fields,
                { photos: 0, proofOfPurchase: false },
                clock.today(),
              ),
            );
            good.push({ row, inst, fields, verdict: r.ok ? r.evaluation.verdict : null });
          }
        }
        errors.push(...rowErrors);
      }
      errors.sort((a, b) => a.row - b.row);
      const blocked = fileErrors.some((e) => e.row === 1);
      let batchId: string | null = null;
      const created: string[] = [];
      if (!dryRun && !blocked && good.length) {
        await ds.transaction(async (m) => {
          const batch = m.create(ClaimBatch, {
            contractorId,
            filename,
            rowCount: rows.length,
            createdById: actor.userId,
          });
          await m.save(batch);
          batchId = batch.id;
          for (const g of good)
            created.push(await claims.create(g.inst, g.fields, actor, { batchId: batch.id, m }));
          await recordAudit(m, actor, {
            action: 'claim_batch.created',
            entityType: 'ClaimBatch',
            entityId: batch.id,
            after: { rows: rows.length, drafts: good.length, filename },
          });
        });
      }
      return {
        dryRun,
        batchId,
        total: rows.length,
        valid: blocked ? 0 : good.length,
        invalid: new Set(errors.filter((e) => e.row > 1).map((e) => e.row)).size,
        created: created.length,
        errors: errors.slice(0, MAX_LISTED_ERRORS),
        errorsTruncated: errors.length > MAX_LISTED_ERRORS,
        rows: good.map((g, i) => ({
          row: g.row,
          claimId: created[i] ?? null,
          installationId: g.inst.id,
          siteName: g.inst.siteName,
          modelNumber: g.inst.productModel.modelNumber,
          serials: g.fields.serials ?? [],
          failedOn: g.fields.failedOn!,
          verdict: g.verdict,
        })),
      };
    },

    async findBatch(user: SessionUser, id: string) {
      const batch = await ds.getRepository(ClaimBatch).findOne({ where: { id } });
      // Another contractor's batch is as missing as a made-up one.
      if (!batch || batch.contractorId !== user.organization.id || user.organization.kind !== 'contractor')
        throw notFound('batch');
      return batch;
    },

    async claimIdsOf(batchId: string) {
      return (
        await ds
          .getRepository(Claim)
          .find({ where: { batchId }, select: { id: true }, order: { createdAt: 'ASC', id: 'ASC' } })
      ).map((c) => c.id);
    },

    /** A batch with its claims, as its page lists them (the newest first, up to 200). */
    async batchPage(user: SessionUser, ability: AppAbility, id: string) {
      const batch = await this.findBatch(user, id);
      const claimIds = await this.claimIdsOf(batch.id);
      const { items } = await claims.list(
        scopeOf(user),
        ability,
        claimListQuerySchema.parse({ pageSize: '200', sort: '-createdAt', batchId: batch.id }),
      );
      return { batch, claimIds, items };
    },

    /** Files every draft of the batch, each in its own transaction: one bad claim does not hold back the rest. */
    async fileBatch(user: SessionUser, batchId: string, actor: Actor): Promise<ClaimBatchFileResult> {
      const ids = await this.claimIdsOf(batchId);
      const results: ClaimBatchFileResult['results'] = [];
      for (const id of ids) {
        try {
          const r = await claims.file(id, user, actor);
          const c = (await ds
            .getRepository(Claim)
            .findOne({ where: { id }, select: { id: true, number: true, stage: true } }))!;
          results.push({ claimId: id, number: c.number, stage: c.stage, ok: true, replayed: r.replayed });
        } catch (err) {
          if (!(err instanceof AppError)) throw err;
          const c = await ds
            .getRepository(Claim)
            .findOne({ where: { id }, select: { id: true, number: true, stage: true } });
          results.push({
            claimId: id,
            number: c?.number ?? null,
            stage: c?.stage ?? 'draft',
            ok: false,
            replayed: false,
            error: { code: err.code, message: err.message, details: err.details },
          });
        }
      }
      return { batchId, results };
    },
  };
}
