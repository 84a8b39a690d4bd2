export * from './analyzer';
