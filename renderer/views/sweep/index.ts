// The Sweep view.
export { mountSweepView, type SweepViewOptions } from './sweep-view';
