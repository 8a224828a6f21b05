import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { OrderStatus } from '../../shared/schemas/orders';

/** What a customer asked the lab to test, and how. */
export class Order extends Model<InferAttributes<Order>, InferCreationAttributes<Order>> {
  declare id: CreationOptional<number>;
  declare number: string;
  declare customerId: number;
  declare poReference: string;
  declare materialSpec: string;
  declare testsRequested: CreationOptional<string[]>;
  declare specimensPerHeat: CreationOptional<number>;
  declare geometryKey: string;
  declare testStandard: string;
  declare areaPolicy: CreationOptional<string>;
  declare retentionDays: number | null;
  declare retentionBasis: CreationOptional<string>;
  declare dueDate: string | null;
  declare status: CreationOptional<OrderStatus>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** Binds the Order model to one connection. */
export function defineOrder(sequelize: Sequelize): typeof Order {
  const M = class extends Order {};
  M.init(
    {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      number: { type: DataTypes.TEXT, allowNull: false },
      customerId: { type: DataTypes.INTEGER, allowNull: false },
      poReference: { type: DataTypes.TEXT, allowNull: false },
      materialSpec: { type: DataTypes.TEXT, allowNull: false },
      testsRequested: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false, defaultValue: ['tensile'] },
      specimensPerHeat: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 2 },
      geometryKey: { type: DataTypes.TEXT, allowNull: false },
      testStandard: { type: DataTypes.TEXT, allowNull: false },
      areaPolicy: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'min-dimensions' },
      retentionDays: { type: DataTypes.INTEGER, allowNull: true },
      retentionBasis: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'report' },
      dueDate: { type: DataTypes.DATEONLY, allowNull: true },
      status: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'open' },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'orders', modelName: 'Order', underscored: true },
  );
  return M;
}
