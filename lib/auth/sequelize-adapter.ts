/**
 * better-auth database adapter on Sequelize + MariaDB, so auth uses the app's one connection pool,
 * one driver and one migration system. better-auth ships no Sequelize adapter; this one is built on
 * its `createAdapterFactory`, which does ids, defaults and value conversion, and passes
 * @better-auth/test-utils' adapter suites (tests/integration/auth-adapter-conformance.test.ts).
 *
 * Tables come from better-auth's own schema (`getAuthTables(options)`), so plugin tables (the
 * organization plugin's organization/member/invitation) follow the options. In production the
 * tables are made by models/migrations/0001-auth.ts; `describeAuthTables` is what both the models
 * here and the migration drift test compare against.
 */
import { DataTypes, Op, Sequelize, type ModelAttributeColumnOptions, type ModelStatic, type Model, type Transaction, type WhereOptions } from "sequelize";
import { createAdapterFactory, type AdapterFactoryOptions, type CleanedWhere, type DBAdapterDebugLogOption, type JoinConfig } from "@better-auth/core/db/adapter";
import { getAuthTables, type BetterAuthDBSchema, type DBFieldAttribute } from "@better-auth/core/db";
import type { BetterAuthOptions } from "@better-auth/core";

// Rows are whatever better-auth's schema declares; the factory types them for its callers.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type Row = Record<string, any>;
type AuthModel = ModelStatic<Model<Row, Row>>;

export type AuthColumnType = "varchar" | "text" | "int" | "bigint" | "tinyint" | "datetime";
export interface AuthColumn {
  name: string;
  type: AuthColumnType;
  nullable: boolean;
  primaryKey?: boolean;
  autoIncrement?: boolean;
  unique?: boolean;
  index?: boolean;
  references?: { table: string; column: string; onDelete: string };
}
export interface AuthTable {
  key: string;
  table: string;
  columns: AuthColumn[];
}

/** Ids, tokens and every other string compare byte-for-byte; LOWER() serves "insensitive" matches. */
export const AUTH_COLLATION = "utf8mb4_bin";

function columnType(field: DBFieldAttribute, idLike: boolean, serial: boolean): AuthColumnType {
  if (idLike) return serial ? "int" : "varchar";
  if (Array.isArray(field.type)) return "varchar"; // an enum of short literals
  switch (field.type) {
    case "string":
      // Indexable strings need a length; free text (tokens, user agents) may be long.
      return field.unique || field.index || field.sortable || field.references ? "varchar" : "text";
    case "number":
      return field.bigint ? "bigint" : "int";
    case "boolean":
      return "tinyint";
    case "date":
      return "datetime"; // DATETIME(3): TIMESTAMP stops at 2038
    default:
      return "text"; // json and arrays, stored as JSON text (supportsJSON/Arrays: false)
  }
}

/** The tables and columns better-auth needs for these options, in creation (reference) order. */
export function describeAuthTables(options: BetterAuthOptions, schema: BetterAuthDBSchema = getAuthTables(options)): AuthTable[] {
  const serial = options.advanced?.database?.generateId === "serial";
  const tables = Object.entries(schema)
    .filter(([, t]) => !t.disableMigrations)
    .map(([key, t]): AuthTable => {
      const columns: AuthColumn[] = [{ name: "id", type: serial ? "int" : "varchar", nullable: false, primaryKey: true, autoIncrement: serial }];
      for (const [fieldKey, field] of Object.entries(t.fields)) {
        if (fieldKey === "id") continue; // the factory adds `id` to the schema it is given
        const ref = field.references;
        const refTable = ref ? (schema[ref.model]?.modelName ?? ref.model) : undefined;
        const refColumn = ref ? (schema[ref.model]?.fields[ref.field]?.fieldName ?? ref.field) : undefined;
        columns.push({
          name: field.fieldName ?? fieldKey,
          type: columnType(field, ref?.field === "id", serial),
          nullable: field.required === false,
          unique: field.unique || undefined,
          index: (field.index && !field.unique) || undefined,
          references: ref ? { table: refTable!, column: refColumn!, onDelete: (ref.onDelete ?? "cascade").toUpperCase() } : undefined,
        });
      }
      return { key, table: t.modelName, columns };
    });
  // Referenced tables first, so creating them in this order satisfies every foreign key.
  const ordered: AuthTable[] = [];
  const pending = [...tables];
  while (pending.length) {
    const i = pending.findIndex((t) => t.columns.every((c) => !c.references || c.references.table === t.table || ordered.some((o) => o.table === c.references!.table) || !pending.some((p) => p.table === c.references!.table)));
    ordered.push(...pending.splice(i < 0 ? 0 : i, 1));
  }
  return ordered;
}

const sequelizeTypes = {
  varchar: () => DataTypes.STRING(255),
  text: () => DataTypes.TEXT,
  int: () => DataTypes.INTEGER,
  bigint: () => DataTypes.BIGINT,
  tinyint: () => DataTypes.BOOLEAN,
  datetime: () => DataTypes.DATE(3),
};

const modelCache = new WeakMap<Sequelize, WeakMap<BetterAuthOptions, Map<string, AuthModel>>>();

/** Sequelize models (keyed by table name) for the auth tables of these options; cached per options object. */
export function defineAuthModels(sequelize: Sequelize, options: BetterAuthOptions, schema?: BetterAuthDBSchema): Map<string, AuthModel> {
  let perOptions = modelCache.get(sequelize);
  if (!perOptions) modelCache.set(sequelize, (perOptions = new WeakMap()));
  const cached = perOptions.get(options);
  if (cached) return cached;
  const models = new Map<string, AuthModel>();
  for (const t of describeAuthTables(options, schema)) {
    const attributes: Record<string, ModelAttributeColumnOptions> = {};
    for (const c of t.columns) {
      attributes[c.name] = {
        type: sequelizeTypes[c.type](),
        allowNull: c.nullable,
        primaryKey: c.primaryKey,
        autoIncrement: c.autoIncrement,
        references: c.references ? { model: c.references.table, key: c.references.column } : undefined,
        onDelete: c.references?.onDelete,
      };
    }
    const indexes = t.columns
      .filter((c) => c.unique || c.index)
      .map((c) => ({ name: `${t.table}_${c.name}_${c.unique ? "uq" : "idx"}`, unique: !!c.unique, fields: [c.name] }));
    // Prefixed model names keep auth models apart from the domain models on the same instance.
    models.set(t.table, sequelize.define(`auth_${t.table}`, attributes, {
      tableName: t.table, timestamps: false, underscored: false, indexes, charset: "utf8mb4", collate: AUTH_COLLATION,
    }) as AuthModel);
  }
  perOptions.set(options, models);
  return models;
}

const likeEscape = (s: string) => s.replace(/[\\%_]/g, "\\$&");

function whereClause(where: CleanedWhere[] | undefined): WhereOptions {
  const and: WhereOptions[] = [];
  const or: WhereOptions[] = [];
  for (const w of where ?? []) {
    const insensitive = w.mode === "insensitive" && (typeof w.value === "string" || (Array.isArray(w.value) && w.value.every((v) => typeof v === "string")));
    const value = insensitive ? (Array.isArray(w.value) ? (w.value as string[]).map((v) => v.toLowerCase()) : String(w.value).toLowerCase()) : w.value;
    let cond: Record<symbol, unknown>;
    switch (w.operator) {
      case "in": cond = { [Op.in]: value }; break;
      case "not_in": cond = { [Op.notIn]: value }; break;
      case "contains": cond = { [Op.like]: `%${likeEscape(String(value))}%` }; break;
      case "starts_with": cond = { [Op.like]: `${likeEscape(String(value))}%` }; break;
      case "ends_with": cond = { [Op.like]: `%${likeEscape(String(value))}` }; break;
      case "ne": cond = value === null ? { [Op.not]: null } : { [Op.ne]: value }; break;
      case "gt": cond = { [Op.gt]: value }; break;
      case "gte": cond = { [Op.gte]: value }; break;
      case "lt": cond = { [Op.lt]: value }; break;
      case "lte": cond = { [Op.lte]: value }; break;
      default: cond = value === null ? { [Op.is]: null } : { [Op.eq]: value };
    }
    // Object form of Sequelize.where: the (fn, Op.in, array) form emits invalid SQL.
    const clause = insensitive ? Sequelize.where(Sequelize.fn("LOWER", Sequelize.col(w.field)), cond) : { [w.field]: cond };
    (w.connector === "OR" ? or : and).push(clause as WhereOptions);
  }
  if (or.length) and.push({ [Op.or]: or });
  return and.length ? { [Op.and]: and } : {};
}

export interface SequelizeAdapterConfig {
  debugLogs?: DBAdapterDebugLogOption;
}

export function sequelizeAdapter(sequelize: Sequelize, adapterConfig: SequelizeAdapterConfig = {}) {
  let lazyOptions: BetterAuthOptions | null = null;

  const createCustomAdapter = (trx?: Transaction): AdapterFactoryOptions["adapter"] => ({ options, schema, getFieldName }) => {
    const models = defineAuthModels(sequelize, options, schema);
    const model = (name: string) => {
      const m = models.get(name);
      if (!m) throw new Error(`better-auth asked for table "${name}", which these auth options do not define`);
      return m;
    };
    const idOf = (modelKey: string) => getFieldName({ model: modelKey, field: "id" });
    // MariaDB has no RETURNING: lock the target row, write, read back, all in one transaction.
    const inTransaction = <R>(fn: (t: Transaction) => Promise<R>): Promise<R> => (trx ? fn(trx) : sequelize.transaction(fn));
    const lockFirst = (name: string, modelKey: string, where: CleanedWhere[], t: Transaction) =>
      model(name).findOne({ where: whereClause(where), attributes: [idOf(modelKey)], lock: t.LOCK.UPDATE, transaction: t, raw: true });
    const byId = (name: string, modelKey: string, id: unknown, t?: Transaction) =>
      model(name).findOne({ where: { [idOf(modelKey)]: id }, transaction: t, raw: true }) as Promise<Row | null>;

    /** Joins as one extra query per joined table (`IN` over the base rows' keys), then grouped. */
    async function attachJoins(rows: Row[], join: JoinConfig | undefined): Promise<Row[]> {
      if (!join || !rows.length) return rows;
      for (const [joinName, cfg] of Object.entries(join)) {
        const keys = [...new Set(rows.map((r) => r[cfg.on.from]).filter((v) => v !== null && v !== undefined))];
        const joined = keys.length
          ? ((await model(joinName).findAll({ where: { [cfg.on.to]: { [Op.in]: keys } }, transaction: trx, raw: true })) as Row[])
          : [];
        for (const r of rows) {
          const matches = joined.filter((j) => r[cfg.on.from] != null && String(j[cfg.on.to]) === String(r[cfg.on.from]));
          r[joinName] = cfg.relation === "one-to-one" ? (matches[0] ?? null) : matches.slice(0, cfg.limit ?? 100);
        }
      }
      return rows;
    }
    const attributesFor = (modelKey: string, select?: string[]) =>
      select?.length ? select.map((field) => getFieldName({ model: modelKey, field })) : undefined;

    return {
      async create({ model: name, modelKey = name, data }) {
        const created = await model(name).create(data, { transaction: trx });
        const id = (data as Row)[idOf(modelKey)] ?? created.get(idOf(modelKey));
        return (await byId(name, modelKey, id, trx)) as never;
      },
      async findOne({ model: name, modelKey = name, where, select, join }) {
        const row = (await model(name).findOne({ where: whereClause(where), attributes: attributesFor(modelKey, select), transaction: trx, raw: true })) as Row | null;
        return row ? ((await attachJoins([row], join))[0] as never) : null;
      },
      async findMany({ model: name, modelKey = name, where, limit, offset, sortBy, select, join }) {
        const rows = (await model(name).findAll({
          where: whereClause(where),
          attributes: attributesFor(modelKey, select),
          limit,
          offset,
          order: sortBy ? [[getFieldName({ model: modelKey, field: sortBy.field }), sortBy.direction.toUpperCase()]] : undefined,
          transaction: trx,
          raw: true,
        })) as Row[];
        return (await attachJoins(rows, join)) as never[];
      },
      async count({ model: name, where }) {
        return model(name).count({ where: whereClause(where), transaction: trx });
      },
      async update({ model: name, modelKey = name, where, update }) {
        return inTransaction(async (t) => {
          const target = (await lockFirst(name, modelKey, where, t)) as Row | null;
          if (!target) return null;
          const id = target[idOf(modelKey)];
          await model(name).update(update as Row, { where: { [idOf(modelKey)]: id }, transaction: t });
          return (await byId(name, modelKey, (update as Row)[idOf(modelKey)] ?? id, t)) as never;
        });
      },
      async updateMany({ model: name, where, update }) {
        const [count] = await model(name).update(update, { where: whereClause(where), transaction: trx });
        return count;
      },
      async delete({ model: name, where }) {
        await model(name).destroy({ where: whereClause(where), transaction: trx });
      },
      async deleteMany({ model: name, where }) {
        return model(name).destroy({ where: whereClause(where), transaction: trx });
      },
      async consumeOne({ model: name, modelKey = name, where }) {
        return inTransaction(async (t) => {
          const target = (await lockFirst(name, modelKey, where, t)) as Row | null;
          if (!target) return null;
          const row = await byId(name, modelKey, target[idOf(modelKey)], t);
          const removed = await model(name).destroy({ where: { [idOf(modelKey)]: target[idOf(modelKey)] }, transaction: t });
          return (removed === 1 ? row : null) as never;
        });
      },
      async incrementOne({ model: name, modelKey = name, where, increment, set }) {
        return inTransaction(async (t) => {
          const target = (await lockFirst(name, modelKey, where, t)) as Row | null;
          if (!target) return null;
          const qi = (c: string) => sequelize.getQueryInterface().quoteIdentifier(c);
          const values: Row = { ...(set ?? {}) };
          for (const [column, delta] of Object.entries(increment)) values[column] = Sequelize.literal(`${qi(column)} + ${Number(delta)}`);
          await model(name).update(values, { where: { [idOf(modelKey)]: target[idOf(modelKey)] }, transaction: t });
          return (await byId(name, modelKey, target[idOf(modelKey)], t)) as never;
        });
      },
    };
  };

  const factoryConfig: AdapterFactoryOptions["config"] = {
    adapterId: "sequelize-mariadb",
    adapterName: "Sequelize MariaDB Adapter",
    debugLogs: adapterConfig.debugLogs ?? false,
    supportsNumericIds: true,
    supportsUUIDs: false, // ids are VARCHAR; the factory generates uuids when asked
    supportsJSON: false,
    supportsArrays: false,
    supportsDates: true,
    supportsBooleans: false, // TINYINT(1) comes back as 0/1
    transaction: (cb) =>
      sequelize.transaction((t) =>
        cb(createAdapterFactory({ config: { ...factoryConfig, transaction: false }, adapter: createCustomAdapter(t) })(lazyOptions!)),
      ),
  };

  const factory = createAdapterFactory({ config: factoryConfig, adapter: createCustomAdapter() });
  return (options: BetterAuthOptions) => {
    lazyOptions = options;
    return factory(options);
  };
}
