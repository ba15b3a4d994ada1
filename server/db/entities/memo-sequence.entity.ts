import { Column, Entity, Index, PrimaryColumn } from 'typeorm';

/** The next memo number per manufacturer and year; taken with SELECT … FOR UPDATE in the issuing transaction. */
@Entity({ name: 'memo_sequences' })
export class MemoSequence {
  @PrimaryColumn({ type: 'uuid', name: 'manufacturer_id' })
  manufacturerId: string;

  @PrimaryColumn({ type: 'smallint', unsigned: true })
  year: number;

  @Column({ type: 'int', unsigned: true, name: 'next_value' })
  nextValue: number;
}

/** The letters a manufacturer's memo numbers carry, chosen once (ALD, then ALD2 for a second Ald… company). */
@Entity({ name: 'memo_prefixes' })
@Index('uq_memo_prefixes_code', ['code'], { unique: true })
export class MemoPrefix {
  @PrimaryColumn({ type: 'uuid', name: 'manufacturer_id' })
  manufacturerId: string;

  @Column({ type: 'varchar', length: 8 })
  code: string;
}
