import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** A short-lived, single-use electronic signature: who signed, with what meaning, and when it was spent. */
export class SignatureToken extends Model<InferAttributes<SignatureToken>, InferCreationAttributes<SignatureToken>> {
  declare id: CreationOptional<number>;
  declare userId: number;
  declare meaning: string;
  declare tokenHash: string;
  declare expiresAt: Date;
  declare usedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
}

/** Binds the SignatureToken model to one connection. */
export function defineSignatureToken(sequelize: Sequelize): typeof SignatureToken {
  const M = class extends SignatureToken {};
  M.init(
    {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      userId: { type: DataTypes.INTEGER, allowNull: false },
      meaning: { type: DataTypes.TEXT, allowNull: false },
      tokenHash: { type: DataTypes.TEXT, allowNull: false },
      expiresAt: { type: DataTypes.DATE, allowNull: false },
      usedAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'signature_tokens', modelName: 'SignatureToken', underscored: true, updatedAt: false },
  );
  return M;
}
