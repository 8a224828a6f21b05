import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { StationKind } from '../../shared/schemas/stations';

/** A place where hand-offs happen: saw, mill, chamber, gauge, frame, bins, store. */
export class Station extends Model<InferAttributes<Station>, InferCreationAttributes<Station>> {
  declare id: CreationOptional<number>;
  declare code: string;
  declare name: string;
  declare kind: StationKind;
  declare active: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** Binds the Station model to one connection. */
export function defineStation(sequelize: Sequelize): typeof Station {
  const M = class extends Station {};
  M.init(
    {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      code: { type: DataTypes.TEXT, allowNull: false },
      name: { type: DataTypes.TEXT, allowNull: false },
      kind: { type: DataTypes.TEXT, allowNull: false },
      active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'stations', modelName: 'Station', underscored: true },
  );
  return M;
}
