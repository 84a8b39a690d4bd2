// The Trade-off panel.
export { mountTradeoff, tallyText, type TradeoffDeps } from './tradeoff-panel';
