import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { Role } from '../../shared/permissions';

/** A person who signs in: machinist, technician, clerk, auditor or manager. */
export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<number>;
  declare email: string;
  declare name: string;
  declare role: Role;
  declare active: CreationOptional<boolean>;
  declare badgeCode: string | null;
  declare passwordHash: string | null;
  declare pinHash: string | null;
  declare failedLogins: CreationOptional<number>;
  declare lockedUntil: Date | null;
  declare sessionVersion: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** Binds the User model to one connection. */
export function defineUser(sequelize: Sequelize): typeof User {
  const M = class extends User {};
  M.init(
    {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      email: { type: DataTypes.TEXT, allowNull: false },
      name: { type: DataTypes.TEXT, allowNull: false },
      role: { type: DataTypes.TEXT, allowNull: false },
      active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      badgeCode: { type: DataTypes.TEXT, allowNull: true },
      passwordHash: { type: DataTypes.TEXT, allowNull: true },
      pinHash: { type: DataTypes.TEXT, allowNull: true },
      failedLogins: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      lockedUntil: { type: DataTypes.DATE, allowNull: true },
      sessionVersion: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'users', modelName: 'User', underscored: true },
  );
  return M;
}
