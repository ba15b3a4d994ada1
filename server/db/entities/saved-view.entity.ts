import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import type { SavedViewFilters } from '../../../shared/schemas/saved-views';
import { CreatedAtColumn } from './columns';
import { User } from './user.entity';

// A person's own named set of review-desk filters ("My open, oldest first"): theirs alone, kept on the server so
// it follows them from the desktop to the phone.
@Entity({ name: 'saved_views' })
@Index('uq_saved_views_user_name', ['userId', 'name'], { unique: true })
export class SavedView {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'uuid', name: 'user_id' })
  userId: string;

  @ManyToOne(() => User, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'user_id' })
  user: Relation<User>;

  @Column({ type: 'varchar', length: 80 })
  name: string;

  @Column({ type: 'json' })
  filters: SavedViewFilters;

  @CreatedAtColumn()
  createdAt: Date;
}
