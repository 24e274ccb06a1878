export * from './parseHl7';
export * from './codes';
export * from './buildAck';
export * from './buildOru';
