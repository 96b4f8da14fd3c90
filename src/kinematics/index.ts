/** Pure sagittal-plane kinematics shared by client and server (no Angular, no Node). */
export * from './geometry';
export * from './angles';
