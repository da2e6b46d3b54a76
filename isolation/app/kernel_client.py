"""papermill's client of a record's workbook kernel: ready without the stock client's idle wait.

jupyter_client's client waits, once the kernel has answered, another 0.2 s for IOPub to fall
silent and throws away what came; a record run pays that on the critical path of every run.
:class:`QuickReadyClient` is ready as soon as the kernel has answered ``kernel_info`` on the
shell channel and IOPub has delivered a message (so it is connected). Dropping the flush is
safe for nbclient, which keeps only messages whose parent is the request it sent.
:class:`isolation.app.record_kernel._EarlyKernel` names it as its kernel manager's client class.
"""

from __future__ import annotations

import time
from queue import Empty

from jupyter_client.asynchronous import AsyncKernelClient

__all__ = ["QuickReadyClient"]


class QuickReadyClient(AsyncKernelClient):
    """An asynchronous kernel client whose :meth:`wait_for_ready` does not wait for IOPub to fall silent."""

    async def wait_for_ready(self, timeout: float | None = None) -> None:
        """Return once the kernel answers ``kernel_info`` and IOPub delivers a message.

        Parameters
        ----------
        timeout : float, optional
            Longest wait (default 60). [s]

        Raises
        ------
        RuntimeError
            The kernel died or did not answer in time (as the stock client).
        """
        limit = 60.0 if timeout is None else timeout
        deadline = time.monotonic() + limit
        while True:
            self.kernel_info()
            try:
                reply = await self.shell_channel.get_msg(timeout=1)
            except Empty:
                reply = None
            if reply is not None and reply["msg_type"] == "kernel_info_reply":
                try:
                    await self.iopub_channel.get_msg(timeout=0.2)  # a message: IOPub is connected
                except Empty:
                    pass
                else:
                    self._handle_kernel_info_reply(reply)
                    return
            if not await self._async_is_alive():
                raise RuntimeError("Kernel died before replying to kernel_info")
            if time.monotonic() > deadline:
                raise RuntimeError(f"Kernel didn't respond in {limit:.0f} seconds")
