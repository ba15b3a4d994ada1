import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

// Failed sign-ins, kept in the database so that the limit holds across server processes.
@Entity({ name: 'login_attempts' })
@Index('ix_login_attempts_email', ['email', 'attemptedAt'])
@Index('ix_login_attempts_ip', ['ip', 'attemptedAt'])
export class LoginAttempt {
  @PrimaryGeneratedColumn({ type: 'bigint', unsigned: true })
  id: string;

  @Column({ type: 'varchar', length: 254 })
  email: string;

  @Column({ type: 'varchar', length: 64 })
  ip: string;

  @Column({ type: 'datetime', precision: 3, name: 'attempted_at' })
  attemptedAt: Date;
}
