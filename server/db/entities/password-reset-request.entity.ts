import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

// Every "forgot password" request, known address or not, kept in the database so that the per-address and
// per-e-mail limits hold across server processes. Rows older than the window are purged as requests arrive.
@Entity({ name: 'password_reset_requests' })
@Index('ix_password_reset_requests_email', ['email', 'requestedAt'])
@Index('ix_password_reset_requests_ip', ['ip', 'requestedAt'])
@Index('ix_password_reset_requests_at', ['requestedAt'])
export class PasswordResetRequest {
  @PrimaryGeneratedColumn({ type: 'bigint', unsigned: true })
  id: string;

  @Column({ type: 'varchar', length: 254 })
  email: string;

  @Column({ type: 'varchar', length: 64 })
  ip: string;

  @Column({ type: 'datetime', precision: 3, name: 'requested_at' })
  requestedAt: Date;
}
