import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import { CreatedAtColumn } from './columns';
import type { RecordBenchTestPayload } from '../../../shared/claims/actions.schema';
import type { Evaluation } from '../../../shared/engine';
import { Claim } from './claim.entity';

// A returned unit on the manufacturer's bench: the lab's readings and the engine run again on them. The claim
// keeps its filing evaluation; both are shown side by side.
@Entity({ name: 'bench_tests' })
@Index('ix_bench_tests_claim', ['claimId', 'testedAt'])
export class BenchTest {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'uuid', name: 'claim_id' })
  claimId: string;

  @ManyToOne(() => Claim, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'claim_id' })
  claim: Relation<Claim>;

  @Column({ type: 'uuid', name: 'return_authorization_id', nullable: true })
  returnAuthorizationId: string | null;

  @Column({ type: 'date', name: 'tested_on' })
  testedOn: string;

  @Column({ type: 'varchar', length: 32 })
  result: string;

  @Column({ type: 'json' })
  readings: RecordBenchTestPayload['readings'];

  @Column({ type: 'json' })
  evaluation: Evaluation;

  @Column({ type: 'varchar', length: 20, name: 'engine_version' })
  engineVersion: string;

  @Column({ type: 'text', nullable: true })
  note: string | null;

  @Column({ type: 'uuid', name: 'tested_by_id' })
  testedById: string;

  @CreatedAtColumn('tested_at')
  testedAt: Date;
}
