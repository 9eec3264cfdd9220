// The plan's defaults per road class (lanes, speed, lane capacity, jam density, each with its
// source): shown and edited in the Assumptions tab, and beside the segment editor's fields left
// at "class default"; its history says who changed which cell.
import { capacityTableHistorySchema, capacityTableSchema, type CapacityTable } from '@shared/api/capacity-table';
import { request } from './http';

export const getCapacityTable = (planId: string) => request('GET', `/plans/${planId}/capacity-table`, capacityTableSchema);
export const putCapacityTable = (planId: string, table: CapacityTable) => request('PUT', `/plans/${planId}/capacity-table`, capacityTableSchema, table);
export const getCapacityTableHistory = (planId: string) => request('GET', `/plans/${planId}/capacity-table/history?limit=50`, capacityTableHistorySchema);
