import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** A heat (or lot): one melt of material, known by its producer's number. */
export class Heat extends Model<InferAttributes<Heat>, InferCreationAttributes<Heat>> {
  declare id: CreationOptional<number>;
  declare heatNumber: string;
  declare material: string;
  declare grade: string;
  declare producer: string;
  declare certificateRef: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** Binds the Heat model to one connection. */
export function defineHeat(sequelize: Sequelize): typeof Heat {
  const M = class extends Heat {};
  M.init(
    {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      heatNumber: { type: DataTypes.TEXT, allowNull: false },
      material: { type: DataTypes.TEXT, allowNull: false },
      grade: { type: DataTypes.TEXT, allowNull: false },
      producer: { type: DataTypes.TEXT, allowNull: false },
      certificateRef: { type: DataTypes.TEXT, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'heats', modelName: 'Heat', underscored: true },
  );
  return M;
}
