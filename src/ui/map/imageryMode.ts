export type ImageryMode = 'pan' | 'natural';
