/**
 * better-auth's tables for Lapbench's auth options (lib/auth/options.ts): email+password, the
 * organization plugin (teams = organizations) and database rate limiting. Table and column names are
 * better-auth's own (camelCase), so its adapter needs no mapping.
 *
 * Frozen DDL, not generated at run time: a migration must do the same thing forever. The test
 * tests/integration/auth-adapter-conformance.test.ts compares these tables with what the adapter
 * expects (describeAuthTables), so a better-auth upgrade or an option change that needs new columns
 * fails there and gets a new migration.
 *
 * DATETIME(3), not TIMESTAMP (TIMESTAMP ends in 2038). Every table is utf8mb4_bin: ids, tokens and
 * keys must match byte-for-byte; the adapter uses LOWER() when better-auth asks for a
 * case-insensitive match (it stores e-mails lower-cased).
 */
import { QueryTypes, type QueryInterface } from "sequelize";

const ID = "`id` VARCHAR(255) NOT NULL PRIMARY KEY";
const ENGINE = "ENGINE=InnoDB DEFAULT CHARSET=utf8mb4 COLLATE=utf8mb4_bin";
const fk = (table: string, column: string, target: string) =>
  `CONSTRAINT \`${table}_${column}_fk\` FOREIGN KEY (\`${column}\`) REFERENCES \`${target}\`(\`id\`) ON DELETE CASCADE`;

export const tables: Record<string, string> = {
  user: `${ID}, \`name\` VARCHAR(255) NOT NULL, \`email\` VARCHAR(255) NOT NULL, \`emailVerified\` TINYINT(1) NOT NULL,
    \`image\` TEXT NULL, \`createdAt\` DATETIME(3) NOT NULL, \`updatedAt\` DATETIME(3) NOT NULL,
    UNIQUE KEY \`user_email_uq\` (\`email\`)`,
  session: `${ID}, \`expiresAt\` DATETIME(3) NOT NULL, \`token\` VARCHAR(255) NOT NULL,
    \`createdAt\` DATETIME(3) NOT NULL, \`updatedAt\` DATETIME(3) NOT NULL, \`ipAddress\` TEXT NULL, \`userAgent\` TEXT NULL,
    \`userId\` VARCHAR(255) NOT NULL, \`activeOrganizationId\` TEXT NULL,
    UNIQUE KEY \`session_token_uq\` (\`token\`), KEY \`session_userId_idx\` (\`userId\`), ${fk("session", "userId", "user")}`,
  account: `${ID}, \`accountId\` TEXT NOT NULL, \`providerId\` TEXT NOT NULL, \`userId\` VARCHAR(255) NOT NULL,
    \`accessToken\` TEXT NULL, \`refreshToken\` TEXT NULL, \`idToken\` TEXT NULL,
    \`accessTokenExpiresAt\` DATETIME(3) NULL, \`refreshTokenExpiresAt\` DATETIME(3) NULL, \`scope\` TEXT NULL,
    \`password\` TEXT NULL, \`createdAt\` DATETIME(3) NOT NULL, \`updatedAt\` DATETIME(3) NOT NULL,
    KEY \`account_userId_idx\` (\`userId\`), ${fk("account", "userId", "user")}`,
  verification: `${ID}, \`identifier\` VARCHAR(255) NOT NULL, \`value\` TEXT NOT NULL, \`expiresAt\` DATETIME(3) NOT NULL,
    \`createdAt\` DATETIME(3) NOT NULL, \`updatedAt\` DATETIME(3) NOT NULL,
    KEY \`verification_identifier_idx\` (\`identifier\`)`,
  organization: `${ID}, \`name\` VARCHAR(255) NOT NULL, \`slug\` VARCHAR(255) NOT NULL, \`logo\` TEXT NULL,
    \`createdAt\` DATETIME(3) NOT NULL, \`metadata\` TEXT NULL,
    UNIQUE KEY \`organization_slug_uq\` (\`slug\`)`,
  member: `${ID}, \`organizationId\` VARCHAR(255) NOT NULL, \`userId\` VARCHAR(255) NOT NULL, \`role\` VARCHAR(255) NOT NULL,
    \`createdAt\` DATETIME(3) NOT NULL,
    KEY \`member_organizationId_idx\` (\`organizationId\`), KEY \`member_userId_idx\` (\`userId\`),
    ${fk("member", "organizationId", "organization")}, ${fk("member", "userId", "user")}`,
  invitation: `${ID}, \`organizationId\` VARCHAR(255) NOT NULL, \`email\` VARCHAR(255) NOT NULL, \`role\` VARCHAR(255) NULL,
    \`status\` VARCHAR(255) NOT NULL, \`expiresAt\` DATETIME(3) NOT NULL, \`createdAt\` DATETIME(3) NOT NULL,
    \`inviterId\` VARCHAR(255) NOT NULL,
    KEY \`invitation_organizationId_idx\` (\`organizationId\`), KEY \`invitation_email_idx\` (\`email\`),
    KEY \`invitation_inviterId_idx\` (\`inviterId\`),
    ${fk("invitation", "organizationId", "organization")}, ${fk("invitation", "inviterId", "user")}`,
  // Sign-in attempts per client and path; shared by every process (rateLimit.storage "database").
  rateLimit: `${ID}, \`key\` VARCHAR(255) NOT NULL, \`count\` INT NOT NULL, \`lastRequest\` BIGINT NOT NULL,
    UNIQUE KEY \`rateLimit_key_uq\` (\`key\`)`,
};

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  for (const [name, body] of Object.entries(tables)) {
    await qi.sequelize.query(`CREATE TABLE \`${name}\` (${body}) ${ENGINE}`, { type: QueryTypes.RAW });
  }
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  for (const name of Object.keys(tables).reverse()) {
    await qi.sequelize.query(`DROP TABLE IF EXISTS \`${name}\``, { type: QueryTypes.RAW });
  }
}
