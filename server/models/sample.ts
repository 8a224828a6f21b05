import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** A piece of one heat received for one order, from which specimens are cut. */
export class Sample extends Model<InferAttributes<Sample>, InferCreationAttributes<Sample>> {
  declare id: CreationOptional<number>;
  declare code: string;
  declare orderId: number;
  declare heatId: number;
  declare position: string;
  declare orientation: string;
  /** numeric(10,3): PostgreSQL returns it as a decimal string. */
  declare thicknessMm: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** Binds the Sample model to one connection. */
export function defineSample(sequelize: Sequelize): typeof Sample {
  const M = class extends Sample {};
  M.init(
    {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      code: { type: DataTypes.TEXT, allowNull: false },
      orderId: { type: DataTypes.INTEGER, allowNull: false },
      heatId: { type: DataTypes.INTEGER, allowNull: false },
      position: { type: DataTypes.TEXT, allowNull: false },
      orientation: { type: DataTypes.TEXT, allowNull: false },
      thicknessMm: { type: DataTypes.DECIMAL(10, 3), allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'samples', modelName: 'Sample', underscored: true },
  );
  return M;
}
