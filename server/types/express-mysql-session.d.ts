declare module 'express-mysql-session' {
  const factory: (session: unknown) => unknown;
  export default factory;
}
