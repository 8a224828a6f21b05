import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** What an e-mailed link is for. */
export type OneTimePurpose = 'invite' | 'reset';

/** An e-mailed link to set a password: hashed, expiring, spent on first use. */
export class OneTimeToken extends Model<InferAttributes<OneTimeToken>, InferCreationAttributes<OneTimeToken>> {
  declare id: CreationOptional<number>;
  declare userId: number;
  declare purpose: OneTimePurpose;
  declare tokenHash: string;
  declare expiresAt: Date;
  declare usedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
}

/** Binds the OneTimeToken model to one connection. */
export function defineOneTimeToken(sequelize: Sequelize): typeof OneTimeToken {
  const M = class extends OneTimeToken {};
  M.init(
    {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      userId: { type: DataTypes.INTEGER, allowNull: false },
      purpose: { type: DataTypes.TEXT, allowNull: false },
      tokenHash: { type: DataTypes.TEXT, allowNull: false },
      expiresAt: { type: DataTypes.DATE, allowNull: false },
      usedAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'one_time_tokens', modelName: 'OneTimeToken', underscored: true, updatedAt: false },
  );
  return M;
}
