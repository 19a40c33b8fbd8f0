export * from './people';
export * from './mail';
export * from './terrain';
