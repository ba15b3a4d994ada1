import { Column, Entity, PrimaryColumn } from 'typeorm';

// rate-limiter-flexible's MariaDB store (server/auth/login-throttle.ts): one row per limiter key, the points
// spent in the current window and when it ends (epoch ms). The limiter writes its rows with a positional INSERT,
// so the columns keep this order. In the database, not in memory, so every server process shares the limits.
@Entity({ name: 'login_limits' })
export class LoginLimit {
  @PrimaryColumn({ type: 'varchar', length: 400 })
  key: string;

  @Column({ type: 'int', default: 0 })
  points: number;

  @Column({ type: 'bigint', unsigned: true, nullable: true })
  expire: string | null;
}
