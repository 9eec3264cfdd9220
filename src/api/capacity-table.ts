// The plan's defaults per road class (lanes, speed, lane capacity, each with its source):
// the segment editor shows them beside the fields that are left at "class default".
import { capacityTableSchema } from '@shared/api/capacity-table';
import { request } from './http';

export const getCapacityTable = (planId: string) => request('GET', `/plans/${planId}/capacity-table`, capacityTableSchema);
