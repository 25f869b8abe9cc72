import { plural } from "@/lib/format";
import { Notice } from "@/components/ui/card";

/** Said on the cut sheet and at the machine when some pieces of a block cannot be cut free. */
export function NotCuttable({ count }: { count: number }) {
  return (
    <Notice tone="danger" title="Do not cut this block from this plan">
      {plural(count, "piece")} of this block cannot be freed by through cuts, nor cut out of one layer with a profile
      cutter. The plan was made with the free layout rule, which is for comparison with box-packing figures only. Plan
      the job again with the guillotine or layers rule before cutting.
    </Notice>
  );
}
