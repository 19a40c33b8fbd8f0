export * from './people';
export * from './mail';
