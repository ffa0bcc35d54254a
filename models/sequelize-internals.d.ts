declare module "sequelize/lib/dialects/mariadb/query" {
  const Query: { prototype: Record<string, unknown> };
  export default Query;
}
