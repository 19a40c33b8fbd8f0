export * from './people';
export * from './mail';
export * from './terrain';
export * from './road-routes';
export * from './vehicle-profiles';
export * from './scenarios';
