import type { Sequelize } from 'sequelize';

let current: Sequelize | null = null;

/** The app's Sequelize instance, for services that open transactions. Set once by createApp. */
export function setSequelize(s: Sequelize) {
  current = s;
}
export function sequelize(): Sequelize {
  if (!current) throw new Error('The database is not initialised.');
  return current;
}
